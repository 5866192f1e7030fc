/**
 * The confirmation that stands between blinded and unblinded mode: it says who may see results by arm. Keyboard focus
 * starts on "Stay blinded", so pressing Enter at once keeps the safe choice.
 */
import type { ReactNode } from 'react';
import { useEffect, useId } from 'react';
import {
  Button,
  Dialog,
  DialogActions,
  DialogBody,
  DialogContent,
  DialogSurface,
  DialogTitle,
} from '@fluentui/react-components';
import { UNBLINDED_CAUTION } from '../core/report/cautions';

export interface UnblindDialogProps {
  readonly open: boolean;
  readonly onConfirm: () => void;
  readonly onCancel: () => void;
}

export function UnblindDialog({ open, onConfirm, onCancel }: UnblindDialogProps): ReactNode {
  const stayId = useId();
  useEffect(() => {
    if (open) document.getElementById(stayId)?.focus();
  }, [open, stayId]);
  return (
    <Dialog open={open} modalType="alert" onOpenChange={(_, data) => (data.open ? undefined : onCancel())}>
      <DialogSurface aria-describedby="unblind-text">
        <DialogBody>
          <DialogTitle>Show results by treatment arm?</DialogTitle>
          <DialogContent id="unblind-text">{UNBLINDED_CAUTION}</DialogContent>
          <DialogActions>
            <Button appearance="primary" onClick={onConfirm}>
              Yes, switch to unblinded
            </Button>
            <Button onClick={onCancel} id={stayId}>
              Stay blinded
            </Button>
          </DialogActions>
        </DialogBody>
      </DialogSurface>
    </Dialog>
  );
}
