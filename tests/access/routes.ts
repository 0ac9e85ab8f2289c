/**
 * The routes in `src/routes`, found from the files themselves: their ids, the HTTP methods
 * a `+server.ts` exports and the form actions a `+page.server.ts` declares.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';

const ROUTES = resolve(import.meta.dirname, '../../src/routes');

export interface RouteFile {
	id: string;
	/** Exported methods of a `+server.ts`. */
	methods: string[];
	/** Named form actions of a `+page.server.ts` (`default` for an unnamed one). */
	actions: string[];
	isPage: boolean;
}

function actionsIn(source: string): string[] {
	const at = source.search(/export const actions\b/);
	if (at < 0) return [];
	const rest = source.slice(at);
	const open = rest.indexOf('{');
	// the actions object: up to the brace that closes it
	let depth = 0;
	let end = open;
	for (let i = open; i < rest.length; i++) {
		if (rest[i] === '{') depth++;
		else if (rest[i] === '}' && --depth === 0) {
			end = i;
			break;
		}
	}
	const body = rest.slice(open + 1, end);
	const names = new Set<string>();
	// keys at the first level: `name: async (...)`, `name(...) {`, or a shorthand `name,`
	let level = 0;
	let token = '';
	for (let i = 0; i < body.length; i++) {
		const ch = body[i];
		if ('{([' .includes(ch)) level++;
		else if ('})]'.includes(ch)) level--;
		if (level === 0 || (level === 1 && ch === '(' && token)) {
			const m = /^\s*,?\s*(\w+)\s*$/.exec(token + '');
			if ((ch === ':' || ch === '(' || ch === ',') && m) names.add(m[1]);
		}
		if (level === 0 && (ch === ',' || ch === ':' || ch === '\n')) token = ch === ':' ? '\u0000' : '';
		else if (level === 0 && token !== '\u0000') token += ch;
	}
	return [...names].sort();
}

export function routeFiles(dir = ROUTES): RouteFile[] {
	const out = new Map<string, RouteFile>();
	const walk = (d: string) => {
		for (const name of readdirSync(d)) {
			const p = join(d, name);
			if (statSync(p).isDirectory()) {
				walk(p);
				continue;
			}
			if (!/^\+(page|server)(\.server)?\.(ts|js|svelte)$/.test(name)) continue;
			const rel = relative(ROUTES, d).split(sep).join('/');
			const id = rel ? `/${rel}` : '/';
			const entry = out.get(id) ?? { id, methods: [], actions: [], isPage: false };
			if (name.startsWith('+page')) entry.isPage = true;
			if (name.startsWith('+server')) {
				const src = readFileSync(p, 'utf8');
				for (const m of src.matchAll(/export\s+(?:const|async\s+function|function)\s+(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS|fallback)\b/g)) {
					entry.methods.push(m[1]);
				}
			}
			if (/^\+page\.server\.(ts|js)$/.test(name)) entry.actions.push(...actionsIn(readFileSync(p, 'utf8')));
			out.set(id, entry);
		}
	};
	if (existsSync(dir)) walk(dir);
	return [...out.values()].sort((a, b) => a.id.localeCompare(b.id));
}
