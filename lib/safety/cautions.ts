/** Topic of a safety caution, for grouping and icons. */
export type SafetyTopic = 'methanol' | 'lye' | 'materials' | 'protective-equipment' | 'rags' | 'waste' | 'local-rules';

/** One caution line to show on batch screens. */
export interface SafetyCaution {
  id: string;
  topic: SafetyTopic;
  text: string;
  source: string;
}

/**
 * The usual cautions for small-batch biodiesel work (common practice; university extension
 * safety guides; figures from NIOSH Pocket Guide, CRC Handbook and NFPA 30). They describe
 * hazards — the app never tells anyone a step is safe. The last item defers to local rules.
 */
export const SAFETY_CAUTIONS: readonly SafetyCaution[] = [
  {
    id: 'methanol-flammable',
    topic: 'methanol',
    text: 'Methanol is highly flammable and burns with a nearly invisible flame (flash point 11–12 °C; flammable at 6.0–36.5 % in air).',
    source: 'University extension safety guides; NIOSH Pocket Guide; CRC Handbook',
  },
  {
    id: 'methanol-toxic',
    topic: 'methanol',
    text: 'Methanol is toxic through skin, breath and mouth — it can cause blindness and death.',
    source: 'University extension safety guides; NIOSH Pocket Guide',
  },
  {
    id: 'methanol-vapour',
    topic: 'methanol',
    text: 'Methanol vapour is heavier than air. Ventilate; no flames or sparks; bond and ground containers during transfers.',
    source: 'University extension safety guides; NFPA 30 (Class IB flammable liquid)',
  },
  {
    id: 'lye-caustic',
    topic: 'lye',
    text: 'Lye (KOH/NaOH) is caustic. Dissolving it in methanol gives off heat: use a closed vessel and keep water out.',
    source: 'University extension safety guides',
  },
  {
    id: 'lye-vessel-metals',
    topic: 'materials',
    text: 'Never mix or hold lye or methoxide in aluminium, tin or zinc (galvanised) vessels: the lye attacks them, giving off flammable hydrogen. Use stainless steel or HDPE.',
    source:
      'University extension safety guides (common practice); alkali attack on aluminium and zinc, CRC Handbook chemistry',
  },
  {
    id: 'b100-materials',
    topic: 'materials',
    text: 'Finished B100 attacks copper, brass, bronze, lead, tin and zinc, and some elastomers (hoses, seals, gaskets): keep it out of them and check fittings.',
    source: 'NREL Biodiesel Handling and Use Guide',
  },
  {
    id: 'ppe',
    topic: 'protective-equipment',
    text: 'Wear chemical-resistant gloves, splash goggles and a face shield; keep an eyewash and running water at hand.',
    source: 'University extension safety guides',
  },
  {
    id: 'bystanders-extinguisher',
    topic: 'protective-equipment',
    text: 'Keep children and pets away; keep a fire extinguisher rated for flammable liquids at hand.',
    source: 'University extension safety guides',
  },
  {
    id: 'rags',
    topic: 'rags',
    text: 'Oil- or fuel-soaked rags can self-heat: store them in closed metal cans.',
    source: 'University extension safety guides',
  },
  {
    id: 'waste',
    topic: 'waste',
    text: 'Crude glycerin and wash water contain methanol and lye: never pour them down drains or onto the ground; follow local disposal rules.',
    source: 'University extension safety guides',
  },
  {
    id: 'local-rules',
    topic: 'local-rules',
    text: 'Always follow local fire codes, chemical-storage rules and licensed practice.',
    source: 'Common practice',
  },
];

/**
 * The altitude caution: methanol boils lower at altitude. Give the boiling point at the co-op's
 * elevation (from lib/chemistry altitudeNote) when it is known.
 */
export const ALTITUDE_CAUTION: SafetyCaution = {
  id: 'altitude',
  topic: 'methanol',
  text: 'At altitude methanol boils below 64.7 °C (148.5 °F) — near 60 °C (140 °F) at 1,600 m (5,250 ft): keep reaction temperatures correspondingly lower.',
  source:
    'NIST Chemistry WebBook (methanol Antoine equation) with the barometric formula (US Standard Atmosphere 1976)',
};

/** The closing line that defers to local rules (the last item of {@link SAFETY_CAUTIONS}). */
export const SAFETY_DEFERENCE = 'Always follow local fire codes, chemical-storage rules and licensed practice.'; // common practice

/**
 * The cautions for one or more topics, always ending with the deference to local rules.
 * @param topics topics to include (all when omitted)
 * @param options altitudeText: the co-op's altitude note (lib/chemistry altitudeNote), added after the methanol cautions
 * @returns caution items in display order
 */
export function safetyCautionsFor(
  topics?: readonly SafetyTopic[],
  options: { altitudeText?: string | null } = {},
): SafetyCaution[] {
  const wanted = topics ? new Set<SafetyTopic>([...topics, 'local-rules']) : null;
  const list = SAFETY_CAUTIONS.filter((c) => wanted === null || wanted.has(c.topic));
  if (options.altitudeText && (wanted === null || wanted.has('methanol'))) {
    const at = list.findIndex((c) => c.topic !== 'methanol' && list.some((m) => m.topic === 'methanol'));
    list.splice(at < 0 ? list.length - 1 : at, 0, { ...ALTITUDE_CAUTION, text: options.altitudeText });
  }
  return list;
}
