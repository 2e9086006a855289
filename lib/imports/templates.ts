// The CSV templates and their columns explained (pure: the import screen shows the same words).
import { ROLES } from '@/lib/auth/roles';
import type { ImportKindName } from '@/lib/validation/imports';

export interface TemplateColumn {
  /** The importer's key for the column. */
  key: string;
  heading: string;
  required: boolean;
  explains: string;
}

export interface ImportTemplate {
  title: string;
  columns: TemplateColumn[];
  /** Example rows (invented people and figures). */
  examples: string[][];
}

type Units = 'us' | 'metric';

/** Templates by kind, worded for the co-op's units (US co-ops: gallons, MM/DD/YYYY; metric: litres, DD/MM/YYYY). */
export const IMPORT_TEMPLATES: Record<ImportKindName, (units: Units) => ImportTemplate> = {
  invitations: () => ({
    title: 'Members to invite',
    columns: [
      { key: 'name', heading: 'Name', required: false, explains: 'The person’s name, used to greet them in the e-mail. They can change it when they accept.' },
      { key: 'email', heading: 'E-mail', required: true, explains: 'Where the invitation goes. Each address once; members and people already invited are skipped.' },
      { key: 'role', heading: 'Role', required: false, explains: `One of ${ROLES.join(', ')}. Empty means member.` },
    ],
    examples: [
      ['Wren Castellano', 'wren@example.org', 'member'],
      ['Ottoline Marsh', 'ottoline@example.org', 'treasurer'],
    ],
  }),
  'opening-balances': (u) => ({
    title: 'Opening balances',
    columns: [
      { key: 'email', heading: 'E-mail', required: true, explains: 'The member’s e-mail (they must be a member already: import invitations first).' },
      { key: 'balance', heading: 'Balance', required: true, explains: `What the member owes (positive) or holds in credit (negative), in the co-op’s currency, e.g. ${u === 'us' ? '1,250.00 or -40.00' : '1.250,00 or -40,00'}.` },
      { key: 'asOf', heading: 'As of', required: true, explains: `The date of the balance, ${u === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY'} or YYYY-MM-DD.` },
    ],
    examples: [['wren@example.org', u === 'us' ? '42.50' : '42,50', u === 'us' ? '12/31/2026' : '31/12/2026']],
  }),
  'opening-tank': (u) => ({
    title: 'Opening tank stock',
    columns: [
      { key: 'tank', heading: 'Tank', required: true, explains: 'The tank’s name as in Tallyvat.' },
      { key: 'quantity', heading: u === 'us' ? 'Gallons' : 'Litres', required: true, explains: `Fuel in the tank, in ${u === 'us' ? 'US gallons' : 'litres'}.` },
      { key: 'cost', heading: u === 'us' ? 'Cost per gallon' : 'Cost per litre', required: true, explains: 'What the fuel cost to make, per unit.' },
    ],
    examples: [['Main tank', u === 'us' ? '1,200' : '4.500', u === 'us' ? '1.85' : '0,49']],
  }),
  'opening-supplies': (u) => ({
    title: 'Chemicals and oil on hand',
    columns: [
      { key: 'kind', heading: 'Kind', required: true, explains: 'methanol, KOH, NaOH or oil. One row per container or purchase, or one per kind.' },
      { key: 'quantity', heading: 'Quantity', required: true, explains: 'How much is on hand, in the unit of the next column.' },
      { key: 'unit', heading: 'Unit', required: true, explains: 'Methanol and oil: L or gal. KOH and NaOH: g, kg or lb.' },
      { key: 'totalCost', heading: 'Total cost', required: true, explains: 'What that quantity cost (the next batches are costed from it, oldest stock first).' },
      { key: 'purityPct', heading: 'Purity %', required: false, explains: 'KOH and NaOH only, from the label (KOH flake is usually about 90).' },
      { key: 'asOf', heading: 'As of', required: false, explains: `When it was bought, ${u === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY'} or YYYY-MM-DD; empty means today.` },
    ],
    examples: [
      ['methanol', u === 'us' ? '55' : '200', u === 'us' ? 'gal' : 'L', u === 'us' ? '190.00' : '180,00', '', ''],
      ['KOH', u === 'us' ? '10' : '5', u === 'us' ? 'lb' : 'kg', u === 'us' ? '42.00' : '21,00', '90', ''],
      ['oil', u === 'us' ? '120' : '450', u === 'us' ? 'gal' : 'L', '0', '', ''],
    ],
  }),
};
