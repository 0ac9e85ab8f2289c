/** Random request keys that also work on plain-http shop networks (no secure context needed). */
export function newKey(prefix = 'k'): string {
	const bytes = new Uint8Array(16);
	globalThis.crypto.getRandomValues(bytes);
	return `${prefix}-${Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('')}`;
}
