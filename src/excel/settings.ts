/** Remembering the pane's last mapping, schedule sheet and settings in the workbook itself (workbook settings). */
import type { SavedSettings } from '../taskpane/actions';
import { ExcelAdapterError, explain } from './errors';

/** The one workbook-settings key Longipane uses; its value is a JSON string. */
export const SETTINGS_KEY = 'longipane.saved.v1';

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * The saved settings from the stored text, or throws ExcelAdapterError when the text is not a JSON object (the pane
 * shows the message; saving again replaces the bad value). Example: parseSaved('{"scheduleSource":"Schedule"}') →
 * { scheduleSource: "Schedule" }.
 */
export function parseSaved(stored: unknown): SavedSettings {
  let value: unknown = stored;
  if (typeof stored === 'string') {
    try {
      value = JSON.parse(stored);
    } catch {
      throw new ExcelAdapterError('The Longipane settings saved in this workbook are not readable; they will be replaced when you next run.');
    }
  }
  if (!isRecord(value)) {
    throw new ExcelAdapterError('The Longipane settings saved in this workbook are not readable; they will be replaced when you next run.');
  }
  return value as SavedSettings;
}

/** The settings saved in this workbook, or null when none are. One request. */
export async function loadSavedSettings(): Promise<SavedSettings | null> {
  return explain('Reading the saved settings', () =>
    Excel.run(async (context) => {
      const item = context.workbook.settings.getItemOrNullObject(SETTINGS_KEY);
      item.load('value');
      await context.sync();
      if (item.isNullObject) return null;
      return parseSaved(item.value);
    }),
  );
}

/** Saves the settings in this workbook (they travel with the file). One request. */
export async function saveSettings(settings: SavedSettings): Promise<void> {
  await explain('Saving the settings', () =>
    Excel.run(async (context) => {
      context.workbook.settings.add(SETTINGS_KEY, JSON.stringify(settings));
      await context.sync();
    }),
  );
}
