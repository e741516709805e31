// The trade words crews use for the same thing, in our own table: generic terms only, no maker or
// brand names. Each set becomes one search token, indexed wherever any of its phrases appears in a
// part's text and read out of the query the same way, so any phrase of a set finds the others.
// Written from common camera-department usage (from memory, not from a published glossary).

export interface SynonymSet {
  /** Short stable name; the token is made from it. */
  key: string;
  /** Phrases as crews type them; hyphens, spaces, case and plural endings are folded when matching. */
  phrases: readonly string[];
}

export const TRADE_SYNONYMS: readonly SynonymSet[] = [
  { key: 'video-receiver', phrases: ['wireless video receiver', 'video receiver', 'wireless receiver', 'receiver', 'rx'] },
  { key: 'video-transmitter', phrases: ['wireless video transmitter', 'video transmitter', 'wireless transmitter', 'transmitter', 'tx'] },
  { key: 'cheese-plate', phrases: ['cheese plate', 'cheese bar', 'cheese stick', 'cheese riser'] },
  { key: 'battery-plate', phrases: ['battery plate', 'battery mount', 'battery adapter plate', 'battery adapter'] },
  { key: 'focus-gear', phrases: ['follow focus gear', 'follow-focus gear', 'lens gear', 'focus gear', 'gear ring', 'lens ring gear', 'seamless gear'] },
  { key: 'accessory-shoe', phrases: ['cold shoe', 'accessory shoe', 'shoe mount', 'hot shoe', 'shoe adapter'] },
  { key: 'top-handle', phrases: ['top handle', 'carry handle', 'carrying handle'] },
  { key: 'rod-clamp', phrases: ['rod clamp', 'rod bracket', 'rod cradle', 'rod holder'] },
  { key: 'monitor-mount', phrases: ['monitor mount', 'monitor bracket', 'monitor yoke', 'monitor cradle', 'monitor holder'] },
  { key: 'lens-support', phrases: ['lens support', 'lens cradle', 'lens support bracket'] },
  { key: 'matte-box', phrases: ['matte box', 'mattebox', 'lens hood', 'sunshade'] },
  { key: 'cable-clip', phrases: ['cable clip', 'cable clamp', 'cable holder', 'cable guide', 'wire clip'] },
  { key: 'cable-relief', phrases: ['cable relief', 'strain relief', 'cable lock'] },
  { key: 'riser', phrases: ['riser', 'spacer', 'riser block', 'riser plate'] },
  { key: 'baseplate', phrases: ['baseplate', 'base plate', 'bottom plate'] },
  { key: 'slate', phrases: ['slate', 'clapperboard', 'clapper'] },
  { key: 'v-style', phrases: ['v-style', 'v-mount', 'v mount', 'v plate'] },
  { key: 'three-stud', phrases: ['3-stud', 'three stud'] },
  { key: 'dust-cap', phrases: ['dust cap', 'port cover', 'port cap', 'cover cap'] },
  { key: 'dovetail', phrases: ['dovetail', 'quick release plate', 'qr plate'] },
];

/** The token standing for a synonym set; "_" at both ends keeps lunr's trimmer and stemmer off it. */
export function synonymToken(key: string): string {
  return `_syn_${key.toLowerCase().replace(/[^a-z0-9]+/g, '_')}_`;
}
