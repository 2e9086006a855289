/** Topic of a safety caution, for grouping and icons. */
export type SafetyTopic = 'methanol' | 'lye' | 'protective-equipment' | 'rags' | 'waste' | 'local-rules';

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

/** The closing line that defers to local rules (the last item of {@link SAFETY_CAUTIONS}). */
export const SAFETY_DEFERENCE = 'Always follow local fire codes, chemical-storage rules and licensed practice.'; // common practice

/**
 * The cautions for one or more topics, always ending with the deference to local rules.
 * @param topics topics to include (all when omitted)
 * @returns caution items in display order
 */
export function safetyCautionsFor(topics?: readonly SafetyTopic[]): SafetyCaution[] {
  const wanted = topics ? new Set<SafetyTopic>([...topics, 'local-rules']) : null;
  return SAFETY_CAUTIONS.filter((c) => wanted === null || wanted.has(c.topic));
}
