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
      {
        key: 'name',
        heading: 'Name',
        required: false,
        explains: 'The person’s name, used to greet them in the e-mail. They can change it when they accept.',
      },
      {
        key: 'email',
        heading: 'E-mail',
        required: true,
        explains: 'Where the invitation goes. Each address once; members and people already invited are skipped.',
      },
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
      {
        key: 'email',
        heading: 'E-mail',
        required: true,
        explains: 'The member’s e-mail (they must be a member already: import invitations first).',
      },
      {
        key: 'balance',
        heading: 'Balance',
        required: true,
        explains: `What the member owes (positive) or holds in credit (negative), in the co-op’s currency, e.g. ${u === 'us' ? '1,250.00 or -40.00' : '1.250,00 or -40,00'}.`,
      },
      {
        key: 'asOf',
        heading: 'As of',
        required: true,
        explains: `The date of the balance, ${u === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY'} or YYYY-MM-DD.`,
      },
    ],
    examples: [['wren@example.org', u === 'us' ? '42.50' : '42,50', u === 'us' ? '12/31/2026' : '31/12/2026']],
  }),
  'opening-tank': (u) => ({
    title: 'Opening tank stock',
    columns: [
      { key: 'tank', heading: 'Tank', required: true, explains: 'The tank’s name as in Tallyvat.' },
      {
        key: 'quantity',
        heading: u === 'us' ? 'Gallons' : 'Litres',
        required: true,
        explains: `Fuel in the tank, in ${u === 'us' ? 'US gallons' : 'litres'}.`,
      },
      {
        key: 'cost',
        heading: u === 'us' ? 'Cost per gallon' : 'Cost per litre',
        required: true,
        explains: 'What the fuel cost to make, per unit.',
      },
    ],
    examples: [['Main tank', u === 'us' ? '1,200' : '4.500', u === 'us' ? '1.85' : '0,49']],
  }),
  'opening-supplies': (u) => ({
    title: 'Chemicals and oil on hand',
    columns: [
      {
        key: 'kind',
        heading: 'Kind',
        required: true,
        explains: 'methanol, KOH, NaOH or oil. One row per container or purchase, or one per kind.',
      },
      {
        key: 'quantity',
        heading: 'Quantity',
        required: true,
        explains: 'How much is on hand, in the unit of the next column.',
      },
      {
        key: 'unit',
        heading: 'Unit',
        required: true,
        explains: 'Methanol and oil: L or gal. KOH and NaOH: g, kg or lb.',
      },
      {
        key: 'totalCost',
        heading: 'Total cost',
        required: true,
        explains: 'What that quantity cost (the next batches are costed from it, oldest stock first).',
      },
      {
        key: 'purityPct',
        heading: 'Purity %',
        required: false,
        explains: 'KOH and NaOH only, from the label (KOH flake is usually about 90).',
      },
      {
        key: 'asOf',
        heading: 'As of',
        required: false,
        explains: `When it was bought, ${u === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY'} or YYYY-MM-DD; empty means today.`,
      },
    ],
    examples: [
      ['methanol', u === 'us' ? '55' : '200', u === 'us' ? 'gal' : 'L', u === 'us' ? '190.00' : '180,00', '', ''],
      ['KOH', u === 'us' ? '10' : '5', u === 'us' ? 'lb' : 'kg', u === 'us' ? '42.00' : '21,00', '90', ''],
      ['oil', u === 'us' ? '120' : '450', u === 'us' ? 'gal' : 'L', '0', '', ''],
    ],
  }),
  'past-batches': (u) => {
    const unit = u === 'us' ? 'gallons' : 'litres';
    const money = (us: string, metric: string) => (u === 'us' ? us : metric);
    return {
      title: 'Past batches',
      columns: [
        {
          key: 'number',
          heading: 'Batch number',
          required: false,
          explains:
            'The batch’s number in your records. It must be new to Tallyvat; leave it empty to number the batch after your highest.',
        },
        {
          key: 'date',
          heading: 'Date',
          required: true,
          explains: `When the batch was made, ${u === 'us' ? 'MM/DD/YYYY' : 'DD/MM/YYYY'} or YYYY-MM-DD. Reports count it in that month.`,
        },
        {
          key: 'oil',
          heading: `Oil in (${unit})`,
          required: true,
          explains: `Oil that went into the batch, in ${unit}.`,
        },
        {
          key: 'fuel',
          heading: `Fuel out (${unit})`,
          required: true,
          explains: `Finished fuel the batch gave, in ${unit} (at most 1.1 × the oil in). Its fuel is not added to a tank: use opening tank stock for what is in your tanks today.`,
        },
        {
          key: 'costPerUnit',
          heading: u === 'us' ? 'Cost per gallon' : 'Cost per litre',
          required: false,
          explains: 'What a unit of the fuel cost, if that is what you kept. Or fill in the input costs instead.',
        },
        {
          key: 'oilCost',
          heading: 'Oil cost',
          required: false,
          explains: 'The batch’s cost of oil (input costs: any you leave empty count as zero).',
        },
        { key: 'methanolCost', heading: 'Methanol cost', required: false, explains: 'The batch’s cost of methanol.' },
        {
          key: 'catalystCost',
          heading: 'Catalyst cost',
          required: false,
          explains: 'The batch’s cost of KOH or NaOH.',
        },
        {
          key: 'energyCost',
          heading: 'Energy cost',
          required: false,
          explains: 'The batch’s cost of heating and pumping.',
        },
        {
          key: 'otherCost',
          heading: 'Other cost',
          required: false,
          explains: 'Anything else (filters, water, tests).',
        },
        {
          key: 'verdict',
          heading: 'Quality',
          required: false,
          explains: 'pass or fail, as recorded then; empty if the batch was not tested.',
        },
        {
          key: 'notes',
          heading: 'Notes',
          required: false,
          explains: 'Quality notes as recorded then (test results, appearance).',
        },
      ],
      examples: [
        [
          '12',
          u === 'us' ? '03/14/2025' : '14/03/2025',
          u === 'us' ? '40' : '150',
          u === 'us' ? '37.5' : '141',
          money('1.92', '0,51'),
          '',
          '',
          '',
          '',
          '',
          'pass',
          'Wash water clear after 3 washes',
        ],
        [
          '13',
          u === 'us' ? '04/02/2025' : '02/04/2025',
          u === 'us' ? '40' : '150',
          u === 'us' ? '36' : '135',
          '',
          money('20.00', '18,00'),
          money('24.50', '22,00'),
          money('6.10', '5,40'),
          money('4.00', '3,50'),
          '',
          '',
          '',
        ],
      ],
    };
  },
};
