// A scenario's row of the final table: what was done, the figures, and the checks that decide ok or
// FAILED (a failed check adds its reason to the figures).

/**
 * The row: `checks` is a list of [passed, what it would mean when it did not]; the result is ok only
 * when every check passed.
 */
export function outcome(scenario, done, figures, checks, seconds) {
	const failed = checks.filter(([passed]) => !passed).map(([, why]) => why);
	return {
		scenario,
		done,
		figures: failed.length ? `${figures}. NOT AS REQUIRED: ${failed.join('; ')}` : figures,
		ok: failed.length === 0,
		seconds
	};
}

function wrap(text, width) {
	const lines = [];
	for (const para of String(text).split('\n')) {
		let line = '';
		for (const word of para.split(/\s+/)) {
			if (line && line.length + 1 + word.length > width) {
				lines.push(line);
				line = word;
			} else line = line ? `${line} ${word}` : word;
			while (line.length > width) {
				lines.push(line.slice(0, width));
				line = line.slice(width);
			}
		}
		lines.push(line);
	}
	return lines;
}

/** The table of every row, its columns wrapped to fit a wide terminal. */
export function table(rows) {
	const widths = [26, 46, 62, 8];
	const head = ['scenario', 'what was done', 'figures', 'result'];
	const rule = `+${widths.map((w) => '-'.repeat(w + 2)).join('+')}+`;
	const out = [rule];
	const put = (cells) => {
		const wrapped = cells.map((c, i) => wrap(c, widths[i]));
		const height = Math.max(...wrapped.map((w) => w.length));
		for (let l = 0; l < height; l++)
			out.push(`| ${wrapped.map((w, i) => (w[l] ?? '').padEnd(widths[i])).join(' | ')} |`);
		out.push(rule);
	};
	put(head);
	for (const r of rows) put([`${r.scenario} (${r.seconds} s)`, r.done, r.figures, r.ok ? 'ok' : 'FAILED']);
	return out.join('\n');
}
