/** The cautions every user acknowledges before first use; also summarised in SAFETY.md. */
export const cautionPoints: readonly { heading: string; text: string }[] = [
  {
    heading: 'A planning aid, not a monitor',
    text: 'Tidewing estimates; it does not measure. Watch the bird: breathing, heart rate, reflexes, temperature and capnography where available. Pulse oximetry and indirect blood pressure are unreliable in birds.',
  },
  {
    heading: 'Population estimates, not this bird',
    text: 'Ventilation, dead space, air-sac volumes, MAC and uptake come from published equations and mammalian assumptions. An individual bird, a sick bird or an unusual species can differ widely. Every figure shows its basis; read it.',
  },
  {
    heading: 'Licensed judgement decides',
    text: 'Tidewing does not replace the judgement of a licensed veterinarian or your local regulations. It ships no drug doses; doses you enter are your clinic’s own responsibility.',
  },
  {
    heading: 'Staff safety',
    text: 'Mask and chamber induction release anaesthetic vapour into the room. Scavenge, ventilate the room and keep exposure below local limits (NIOSH 1977 recommends a 2 ppm ceiling for halogenated agents).',
  },
  {
    heading: 'Oxygen fire risk',
    text: 'Oxygen-enriched air makes materials burn fiercely. Keep ignition sources, electrocautery sparks and oil or grease away from oxygen equipment and cylinders.',
  },
];
