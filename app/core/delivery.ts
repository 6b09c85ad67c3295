/**
 * How the agent reaches the bird: the delivery routes and the breathing systems, declared once.
 * The contract's zod enums, the database's stored values and every label on the screens and the
 * worksheet read these lists.
 */

/** Delivery routes, in the order the screens offer them. */
export const routes = ['mask', 'chamber', 'endotracheal', 'airSacTube'] as const;
export type Route = (typeof routes)[number];

/** Breathing systems (circuits), in the order the screens offer them. */
export const circuits = ['nonRebreathing', 'circle'] as const;
export type Circuit = (typeof circuits)[number];

/** Plain names of the delivery routes, as the screens, records and worksheet show them. */
export const routeLabels: Readonly<Record<Route, string>> = {
  mask: 'Face mask',
  chamber: 'Induction chamber',
  endotracheal: 'Endotracheal tube',
  airSacTube: 'Air-sac tube',
};

/** Plain names of the breathing systems. */
export const circuitLabels: Readonly<Record<Circuit, string>> = {
  nonRebreathing: 'Non-rebreathing system',
  circle: 'Circle system (rebreathing)',
};
