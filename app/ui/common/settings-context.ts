import { createContext, useContext } from 'react';
import { defaultClinicSettings, type ClinicSettings } from '../../contract/settings.js';

/** The clinic's saved settings (units, paper), null before first setup. */
export const SettingsContext = createContext<ClinicSettings | null>(null);

export function useClinicSettings(): ClinicSettings {
  return useContext(SettingsContext) ?? defaultClinicSettings;
}
