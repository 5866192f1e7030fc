/** The single-column roles the pane offers for confirmation, in the order shown, with plain labels. */
import type { Role } from '../core/intake/types';

export type SingleRole = Exclude<Role, 'covariate'>;

export interface RoleInfo {
  readonly role: SingleRole;
  readonly label: string;
  /** One short line telling the user what the role is for. */
  readonly help: string;
}

export const ROLES: readonly RoleInfo[] = [
  { role: 'subject', label: 'Participant', help: 'Needed. One id per participant.' },
  { role: 'date', label: 'Visit date', help: 'The date of the visit, or give a study day instead.' },
  { role: 'studyDay', label: 'Study day', help: 'Used when there is no visit date.' },
  {
    role: 'reference',
    label: 'Reference date',
    help: 'Randomisation or first-dose date; without it, the first scheduled visit counts.',
  },
  { role: 'visit', label: 'Visit name', help: 'Optional. Without it, records match the nearest target day.' },
  { role: 'value', label: 'Value', help: 'Needed for the model. A number.' },
  { role: 'arm', label: 'Treatment arm', help: 'Read only in unblinded mode.' },
  { role: 'site', label: 'Site', help: 'Optional. Gives the by-site report.' },
  {
    role: 'exit',
    label: 'Exit date',
    help: 'Optional. The date the participant left the study; later visits are not counted as missed.',
  },
  { role: 'exitStatus', label: 'End-of-study status', help: 'Optional. Carried into the list of participants who left.' },
  { role: 'exitReason', label: 'Reason for leaving', help: 'Optional. Carried into the list of participants who left.' },
];
