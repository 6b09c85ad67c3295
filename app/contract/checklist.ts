/**
 * The pre-anaesthetic checklist items and their states, as plain constants (no schema code), so
 * the printed worksheet can name them without loading the validation library.
 */

/** State of one pre-anaesthetic checklist item. */
export const checklistStates = ['open', 'done', 'not applicable'] as const;

export const checklistItems = [
  { key: 'fastingAndCrop', label: 'Fasting and crop check' },
  { key: 'hydration', label: 'Hydration assessed' },
  { key: 'bloods', label: 'Bloods (if taken) reviewed' },
  { key: 'equipmentLeakCheck', label: 'Equipment leak check' },
  { key: 'oxygenSupply', label: 'Oxygen supply checked' },
  { key: 'scavenging', label: 'Scavenging connected' },
  { key: 'emergencyCard', label: 'Emergency card ready' },
] as const;

export type ChecklistKey = (typeof checklistItems)[number]['key'];
