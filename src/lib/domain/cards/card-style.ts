/**
 * The looks a priority card can take: a shape, a colour from Spoolyard's palette and a word.
 * The shape and the word tell the styles apart on their own; the colour only helps.
 * The shapes are not the signal glyphs (circle, triangle, square, two bars) so a card never
 * reads as a passed/failed/held state.
 */
export type CardShape = 'diamond' | 'hexagon' | 'chevron' | 'flag' | 'star' | 'ring';

export interface CardStyle {
	key: CardStyleKey;
	label: string;
	shape: CardShape;
	/** A colour token from tailwind.config.ts, used as a text-* class on the glyph. */
	colour: string;
	/** What the style is for, as a hint in the editor. */
	hint: string;
}

export const CARD_STYLE_KEYS = ['rush', 'customer', 'restock', 'finish', 'kit', 'plain'] as const;
export type CardStyleKey = (typeof CARD_STYLE_KEYS)[number];

export const CARD_STYLES: Record<CardStyleKey, CardStyle> = {
	rush: { key: 'rush', label: 'Rush', shape: 'diamond', colour: 'text-signal-stop', hint: 'A customer is waiting now.' },
	customer: { key: 'customer', label: 'Customer', shape: 'flag', colour: 'text-temper-500', hint: "A customer's own unit or a promised order." },
	restock: { key: 'restock', label: 'Restock', shape: 'hexagon', colour: 'text-signal-go', hint: 'Build stock for the depots or the web shop.' },
	finish: { key: 'finish', label: 'Finish first', shape: 'chevron', colour: 'text-signal-warn', hint: 'Work already started that should flow out first.' },
	kit: { key: 'kit', label: 'Kit', shape: 'star', colour: 'text-signal-hold', hint: 'Units that ship together in a kit.' },
	plain: { key: 'plain', label: 'Priority', shape: 'ring', colour: 'text-graphite-400', hint: 'Anything else.' }
};

export function isCardStyleKey(value: unknown): value is CardStyleKey {
	return typeof value === 'string' && (CARD_STYLE_KEYS as readonly string[]).includes(value);
}
