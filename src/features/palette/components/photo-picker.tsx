import { useRef, useState, type KeyboardEvent, type MouseEvent } from 'react';

type Point = { x: number; y: number };

/**
 * The reference photo as a place to click: a click picks that point; with the keyboard, the arrow keys
 * move the marker (Shift for larger steps) and Enter or Space picks it. x and y are fractions 0..1.
 */
export function PhotoPicker({ src, alt, picked, onPick }: { src: string; alt: string; picked: Point | null; onPick: (p: Point) => void }) {
  const ref = useRef<HTMLButtonElement>(null);
  const [cursor, setCursor] = useState<Point>(picked ?? { x: 0.5, y: 0.5 });
  const [usingKeys, setUsingKeys] = useState(false);

  function click(e: MouseEvent<HTMLButtonElement>) {
    const img = ref.current?.querySelector('img');
    if (!img) return;
    const r = img.getBoundingClientRect();
    // A click from the keyboard arrives with no position: it picks the marker instead.
    if (e.detail === 0) {
      onPick(cursor);
      return;
    }
    const p = { x: clamp((e.clientX - r.left) / r.width), y: clamp((e.clientY - r.top) / r.height) };
    setCursor(p);
    setUsingKeys(false);
    onPick(p);
  }

  function keys(e: KeyboardEvent<HTMLButtonElement>) {
    const step = e.shiftKey ? 0.1 : 0.02;
    const moves: Record<string, Point> = {
      ArrowLeft: { x: -step, y: 0 },
      ArrowRight: { x: step, y: 0 },
      ArrowUp: { x: 0, y: -step },
      ArrowDown: { x: 0, y: step },
    };
    const m = moves[e.key];
    if (!m) return;
    e.preventDefault();
    setUsingKeys(true);
    setCursor((c) => ({ x: clamp(c.x + m.x), y: clamp(c.y + m.y) }));
  }

  const marker = usingKeys ? cursor : picked;
  return (
    <button
      ref={ref}
      type="button"
      onClick={click}
      onKeyDown={keys}
      aria-label={`${alt}. Click a point to find its nearest paints; or move the marker with the arrow keys and press Enter.`}
      className="relative block w-full cursor-crosshair overflow-hidden rounded-card border border-primer-300 bg-primer-100 p-0"
    >
      <img src={src} alt="" className="block h-auto w-full select-none" draggable={false} />
      {marker && (
        <span
          aria-hidden="true"
          className="pointer-events-none absolute size-6 -translate-x-1/2 -translate-y-1/2 rounded-full border-2 border-white shadow-[0_0_0_2px_#2B211C]"
          style={{ left: `${marker.x * 100}%`, top: `${marker.y * 100}%` }}
        />
      )}
    </button>
  );
}

const clamp = (v: number) => Math.min(1, Math.max(0, v));
