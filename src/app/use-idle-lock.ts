import { useEffect, useRef } from 'preact/hooks';

const activityEvents = ['pointerdown', 'keydown', 'touchstart', 'wheel'] as const;

/** Calls onIdle after the given minutes without a touch or key press (the unit sets the minutes). */
export function useIdleLock(minutes: number, onIdle: () => void): void {
  const onIdleRef = useRef(onIdle);
  onIdleRef.current = onIdle;
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout>;
    const restart = () => {
      clearTimeout(timer);
      timer = setTimeout(() => onIdleRef.current(), minutes * 60_000);
    };
    restart();
    for (const name of activityEvents) window.addEventListener(name, restart, { passive: true });
    return () => {
      clearTimeout(timer);
      for (const name of activityEvents) window.removeEventListener(name, restart);
    };
  }, [minutes]);
}
