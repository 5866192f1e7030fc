// @vitest-environment jsdom
/** The schedule step: Excel chooses a schedule sheet; the page has its file picker only. */
import './jsdomSetup';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { FluentProvider, webLightTheme } from '@fluentui/react-components';
import { ScheduleStep, type ScheduleStepProps } from '../../src/taskpane/ScheduleStep';

afterEach(cleanup);

const base: ScheduleStepProps = {
  sources: [{ name: 'egfr-schedule.csv' }, { name: 'Starter schedule' }],
  allowFile: true,
  busy: false,
  current: 'egfr-schedule.csv',
  result: { ok: true, schedule: [{ label: 'Baseline', targetDay: 1, before: 3, after: 3 }] },
  onLoad: () => undefined,
  onFile: () => undefined,
  onStarter: () => undefined,
};

const show = (props: Partial<ScheduleStepProps>): void => {
  render(
    <FluentProvider theme={webLightTheme}>
      <ScheduleStep {...base} {...props} />
    </FluentProvider>,
  );
};

describe('ScheduleStep', () => {
  it('on the page, schedules already read are not offered again in a second control (only the file picker)', () => {
    show({ allowFile: true });
    expect(screen.queryByRole('button', { name: 'Use this schedule' })).toBeNull();
    expect(screen.queryByRole('combobox')).toBeNull();
    expect(screen.getByLabelText('Schedule file (CSV)')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Use the starter schedule' })).toBeTruthy();
  });

  it('in Excel, the schedule sheets of the workbook are offered to choose from', () => {
    show({ allowFile: false, sources: [{ name: 'Schedule' }], current: 'Schedule' });
    expect(screen.getByRole('combobox', { name: 'Schedule sheet' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Use this schedule' })).toBeTruthy();
    expect(screen.queryByLabelText('Schedule file (CSV)')).toBeNull();
  });
});
