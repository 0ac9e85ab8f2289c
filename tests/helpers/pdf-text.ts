/**
 * The text drawn on a PDF's pages, good enough to search: every stream is inflated (zlib, the
 * FlateDecode filter of ISO 32000-1 §7.4.4) and the strings shown with Tj are decoded. pdf-lib
 * writes standard-font text as hex strings (`<48656C6C6F> Tj`) in WinAnsi, read here as Latin-1.
 */
import { inflateSync } from 'node:zlib';

export function pdfText(pdf: Uint8Array): string {
	const raw = Buffer.from(pdf).toString('latin1');
	const out: string[] = [];
	for (const m of raw.matchAll(/stream\r?\n([\s\S]*?)\r?\nendstream/g)) {
		const bytes = Buffer.from(m[1], 'latin1');
		let content: string;
		try {
			content = inflateSync(bytes).toString('latin1');
		} catch {
			content = m[1];
		}
		for (const t of content.matchAll(/<([0-9A-Fa-f\s]*)>\s*Tj/g)) out.push(Buffer.from(t[1].replace(/\s+/g, ''), 'hex').toString('latin1'));
		for (const t of content.matchAll(/\(((?:\\.|[^\\)])*)\)\s*Tj/g)) out.push(t[1].replace(/\\(.)/g, '$1'));
	}
	return out.join('\n');
}
