/** The standing cautions (SPEC §2), shown beside every result in the same words as on the sheets. */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import { CAUTIONS } from '../core/report/cautions';

const useStyles = makeStyles({
  box: {
    borderLeft: `4px solid ${tokens.colorPaletteMarigoldBorderActive}`,
    backgroundColor: tokens.colorPaletteYellowBackground1,
    padding: `${tokens.spacingVerticalXS} ${tokens.spacingHorizontalS}`,
    fontSize: tokens.fontSizeBase200,
  },
  title: { margin: 0, fontWeight: tokens.fontWeightSemibold, fontSize: tokens.fontSizeBase300 },
  list: { margin: `${tokens.spacingVerticalXS} 0 0 0`, paddingLeft: '18px' },
});

export function CautionList(): ReactNode {
  const styles = useStyles();
  return (
    <aside className={styles.box} aria-labelledby="cautions-title">
      <h3 className={styles.title} id="cautions-title">
        Before you read the results
      </h3>
      <ul className={styles.list}>
        {CAUTIONS.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}
