import { useEffect } from 'react';
import { useBlocker } from 'react-router-dom';
import { Button } from './button';
import { Dialog } from './dialog';

/** Asks before leaving with changes that are not saved: inside the app with a dialog, when closing the tab with the browser's own question. */
export function LeaveGuard({ dirty }: { dirty: boolean }) {
  const blocker = useBlocker(({ currentLocation, nextLocation }) => dirty && currentLocation.pathname !== nextLocation.pathname);
  useEffect(() => {
    if (!dirty) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [dirty]);
  if (blocker.state !== 'blocked') return null;
  return (
    <Dialog
      open
      onClose={() => blocker.reset()}
      title="Leave without saving?"
      description="The changes on this page are not saved yet."
      footer={
        <>
          <Button variant="secondary" onClick={() => blocker.reset()}>
            Stay here
          </Button>
          <Button variant="danger" onClick={() => blocker.proceed()}>
            Leave and lose them
          </Button>
        </>
      }
    />
  );
}
