import { lazy } from 'react';
import type { Route } from '../shell/areas.js';
import { PatientFormScreen } from './patient-form.js';
import { PatientListScreen } from './patient-list.js';

// The patient's page, with its weight chart (the charting library), loads when first opened, so
// the list, the first screen, does not wait for it (app.tsx shows the loading line meanwhile).
const PatientDetailScreen = lazy(() =>
  import('./patient-detail.js').then((module) => ({ default: module.PatientDetailScreen })),
);

/** Patients: `#/patients`, `#/patients/new`, `#/patients/<id>`, `#/patients/<id>/edit`. */
export function PatientsArea({ route }: { readonly route: Route }) {
  const [first, second] = route.segments;
  if (first === undefined) return <PatientListScreen />;
  if (first === 'new') return <PatientFormScreen patientId={null} />;
  const id = Number(first);
  if (!Number.isInteger(id) || id <= 0) return <PatientListScreen />;
  if (second === 'edit') return <PatientFormScreen key={id} patientId={id} />;
  return <PatientDetailScreen key={id} patientId={id} />;
}
