import { useLayoutEffect } from 'react';
import { cssStringToken } from '../../core/worksheet.js';
import './printed-pages.css';

/** The class that puts a printed page on the clinic's paper (named pages in printed-pages.css). */
export function paperClass(paperSize: 'A4' | 'Letter'): string {
  return paperSize === 'Letter' ? 'printed-letter' : 'printed-a4';
}

/**
 * The running lines of every printed page go to the page margins (`@page` margin boxes, which
 * take only strings): they are handed over as CSS custom properties on the root element, read by
 * printed-pages.css, and removed when the printed page goes. Plain hooks only (print.html
 * renders through Preact's compatibility layer).
 */
export function usePrintedRunningLines(who: string, which: string, title: string): void {
  useLayoutEffect(() => {
    const style = document.documentElement.style;
    style.setProperty('--print-running-who', cssStringToken(who));
    style.setProperty('--print-running-which', cssStringToken(which));
    style.setProperty('--print-running-title', cssStringToken(title));
    return () => {
      style.removeProperty('--print-running-who');
      style.removeProperty('--print-running-which');
      style.removeProperty('--print-running-title');
    };
  }, [who, which, title]);
}
