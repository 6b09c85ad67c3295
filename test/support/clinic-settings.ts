/** The invented clinic of the tests and demo data, as its Settings would be saved. */
export const heronLaneSettings = {
  clinicName: 'Heron Lane Bird Clinic',
  addressLine: '4 Heron Lane, Marshfield',
  massUnit: 'g',
  pressureUnit: 'mmHg',
  temperatureUnit: 'C',
  defaultAgent: 'isoflurane',
  paperSize: 'A4',
} as const;

/** Settings of the throw-away clinic the benches create. */
export const benchClinicSettings = {
  ...heronLaneSettings,
  clinicName: 'Bench Clinic',
  addressLine: '',
} as const;
