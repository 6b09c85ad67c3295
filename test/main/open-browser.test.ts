import { describe, expect, it } from 'vitest';
import { openInSystemBrowser } from '../../main/host/open-browser.js';

describe('openInSystemBrowser', () => {
  it('refuses anything but a one-time loopback start address, before starting any program', () => {
    for (const url of [
      'http://127.0.0.1:8080/?token=abc',
      'http://127.0.0.1:8080/',
      'http://localhost:8080/?start=abc',
      'https://example.org/?start=abc',
      'http://127.0.0.1:8080/?start=abc&next=http://example.org',
      'http://127.0.0.1:8080/?start=abc; rm -rf ~',
    ])
      expect(() => openInSystemBrowser(url, 'linux'), url).toThrow(/one-time loopback start address/);
  });
});
