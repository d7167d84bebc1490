import { useEffect, useState } from 'react';

/** "1:05:09" since `from`, ticking each second. */
export function useElapsed(from: string | null | undefined): string {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (!from) return;
    const t = window.setInterval(() => setNow(Date.now()), 1000);
    return () => window.clearInterval(t);
  }, [from]);
  if (!from) return '';
  const s = Math.max(0, Math.floor((now - Date.parse(from)) / 1000));
  const hh = Math.floor(s / 3600);
  const mm = String(Math.floor((s % 3600) / 60)).padStart(2, '0');
  const ss = String(s % 60).padStart(2, '0');
  return `${hh}:${mm}:${ss}`;
}
