/**
 * Style pieces that several pane components share, so a step body, a subheading or a small table looks the same in
 * every step. Each component still builds its own classes with makeStyles and spreads these in.
 */
import { tokens, type GriffelStyle } from '@fluentui/react-components';

/** A step's body: its parts stacked with the small vertical gap. */
export const stackStyle: GriffelStyle = { display: 'flex', flexDirection: 'column', gap: tokens.spacingVerticalS };

/** A heading inside a step (an h3), the size of body text but semibold. */
export const subheadStyle: GriffelStyle = { margin: 0, fontSize: tokens.fontSizeBase300, fontWeight: tokens.fontWeightSemibold };

/** The scrolling frame around a small table. */
export const tableFrameStyle: GriffelStyle = {
  border: `1px solid ${tokens.colorNeutralStroke2}`,
  borderRadius: tokens.borderRadiusMedium,
};

/** A small table's header cell. */
export const tableHeadStyle: GriffelStyle = {
  textAlign: 'left',
  padding: '2px 6px',
  backgroundColor: tokens.colorNeutralBackground3,
};

/** A small table's body cell, ruled off from the row above. */
export const tableCellStyle: GriffelStyle = { padding: '2px 6px', borderTop: `1px solid ${tokens.colorNeutralStroke2}` };
