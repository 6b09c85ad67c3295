import { useEffect, useState, type RefObject } from 'react';

/**
 * Whether an element held at the top of the window (a sticky panel from `stickyTop` px, `height`
 * tall) would cover part of a target whose box runs from `targetTop` to `targetBottom` (window
 * coordinates): true while the target reaches into that band.
 */
export function coversTarget(
  stickyTop: number,
  height: number,
  targetTop: number,
  targetBottom: number,
): boolean {
  return targetTop < stickyTop + height && targetBottom > stickyTop;
}

/**
 * True while the sticky element would cover part of the target where it sticks: the element is
 * then let go (not sticky) so that nothing of the target is hidden, and held again once the target
 * has left that band. Sticky or not, the element keeps its place in the flow, so letting go moves
 * nothing else. Checked once a frame while the page scrolls or either element changes size.
 */
export function useCovers(
  sticky: RefObject<HTMLElement | null>,
  target: RefObject<HTMLElement | null>,
): boolean {
  const [covers, setCovers] = useState(false);
  useEffect(() => {
    const element = sticky.current;
    const below = target.current;
    if (element === null || below === null) return;
    let frame = 0;
    const check = () => {
      frame = 0;
      const top = Number.parseFloat(getComputedStyle(element).top);
      const box = below.getBoundingClientRect();
      setCovers(coversTarget(Number.isFinite(top) ? top : 0, element.offsetHeight, box.top, box.bottom));
    };
    const schedule = () => {
      if (frame === 0) frame = requestAnimationFrame(check);
    };
    schedule();
    window.addEventListener('scroll', schedule, { passive: true, capture: true });
    window.addEventListener('resize', schedule);
    const resize = new ResizeObserver(schedule);
    resize.observe(element);
    resize.observe(below);
    return () => {
      if (frame !== 0) cancelAnimationFrame(frame);
      window.removeEventListener('scroll', schedule, { capture: true });
      window.removeEventListener('resize', schedule);
      resize.disconnect();
    };
  }, [sticky, target]);
  return covers;
}
