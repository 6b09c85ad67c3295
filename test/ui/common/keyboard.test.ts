import { describe, expect, it } from 'vitest';
import { isSearchShortcut, isTypingIn } from '../../../app/ui/common/keyboard.js';

const slash = { key: '/', ctrlKey: false, metaKey: false, altKey: false, defaultPrevented: false };

describe('the "/" shortcut to the patient search', () => {
  it('focuses the search when focus is on the page, a link or a button', () => {
    expect(isSearchShortcut(slash, null)).toBe(true);
    expect(isSearchShortcut(slash, { tagName: 'BODY' })).toBe(true);
    expect(isSearchShortcut(slash, { tagName: 'A' })).toBe(true);
    expect(isSearchShortcut(slash, { tagName: 'BUTTON' })).toBe(true);
    expect(isSearchShortcut(slash, { tagName: 'INPUT', type: 'checkbox' })).toBe(true);
  });

  it('leaves "/" to any field being typed in: text, search, date, number, text area, list, editable text', () => {
    for (const type of ['text', 'search', 'date', 'number', 'datetime-local', 'TEXT'])
      expect(isSearchShortcut(slash, { tagName: 'INPUT', type })).toBe(false);
    expect(isSearchShortcut(slash, { tagName: 'input' })).toBe(false);
    expect(isSearchShortcut(slash, { tagName: 'TEXTAREA' })).toBe(false);
    expect(isSearchShortcut(slash, { tagName: 'SELECT' })).toBe(false);
    expect(isSearchShortcut(slash, { tagName: 'DIV', isContentEditable: true })).toBe(false);
    expect(isTypingIn({ tagName: 'INPUT', type: 'radio' })).toBe(false);
  });

  it('ignores other keys, "/" with a modifier, during composition or when already handled', () => {
    expect(isSearchShortcut({ ...slash, key: '?' }, null)).toBe(false);
    expect(isSearchShortcut({ ...slash, ctrlKey: true }, null)).toBe(false);
    expect(isSearchShortcut({ ...slash, metaKey: true }, null)).toBe(false);
    expect(isSearchShortcut({ ...slash, altKey: true }, null)).toBe(false);
    expect(isSearchShortcut({ ...slash, isComposing: true }, null)).toBe(false);
    expect(isSearchShortcut({ ...slash, defaultPrevented: true }, null)).toBe(false);
  });
});
