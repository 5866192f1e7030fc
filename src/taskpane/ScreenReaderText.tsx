/** Text read by screen readers but not shown (the usual clip-rect technique). */
import type { ReactNode } from 'react';
import { makeStyles } from '@fluentui/react-components';

const useStyles = makeStyles({
  hidden: {
    position: 'absolute',
    width: '1px',
    height: '1px',
    padding: 0,
    margin: '-1px',
    overflow: 'hidden',
    clip: 'rect(0, 0, 0, 0)',
    whiteSpace: 'nowrap',
    border: 0,
  },
});

export function ScreenReaderText({ children }: { readonly children: ReactNode }): ReactNode {
  return <span className={useStyles().hidden}>{children}</span>;
}
