import { useState } from 'react';
import { buttonSecondary } from '../ui';
import { withQueryClient } from '../table/withQueryClient';
import { useDeleteCapture } from './queries';
import { ConfirmDialog } from './ConfirmDialog';

/** Delete button of the capture page, with confirmation; goes back to the list afterwards. */
function DeleteCaptureButton({ id, name }: { id: string; name: string }) {
  const remove = useDeleteCapture();
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function confirm() {
    setBusy(true);
    setError(null);
    try {
      await remove.mutateAsync(id);
      window.location.assign('/captures');
    } catch (failure) {
      setBusy(false);
      setError((failure as Error).message);
    }
  }
  return (
    <>
      <button type="button" className={buttonSecondary + ' text-danger'} onClick={() => setOpen(true)}>
        Delete…
      </button>
      <ConfirmDialog open={open} title="Delete this capture?" confirmLabel="Delete capture" busy={busy} error={error} onConfirm={confirm} onCancel={() => setOpen(false)}>
        <p>
          <span className="font-medium text-ink">{name}</span>: its samples and metadata are removed for good.
        </p>
      </ConfirmDialog>
    </>
  );
}

export default withQueryClient(DeleteCaptureButton, 0);
