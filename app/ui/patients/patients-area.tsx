import type { Route } from '../shell/areas.js';
import { PatientDetailScreen } from './patient-detail.js';
import { PatientFormScreen } from './patient-form.js';
import { PatientListScreen } from './patient-list.js';

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
