/** First stop for keyboard users: straight past the header and rail. */
export function SkipLink() {
  return (
    <a
      href="#main"
      className="sr-only z-50 rounded-control bg-bone-50 px-3 py-2 text-sm font-medium shadow-raised focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
    >
      Skip to content
    </a>
  );
}
