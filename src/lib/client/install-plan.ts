import { ApiError } from '@/lib/client/api-client';

/** One danger finding a plan brings: its identity (code and part) and its words. */
export interface AddedDanger {
	key: string;
	message: string;
}

/** The question asked before a plan is installed, naming any danger finding it brings. */
export function installQuestion(name: string, dangers: readonly string[]): string {
	const ask = `Install “${name}” as the next revision of the build? Its changes are saved on top of the current revision.`;
	if (dangers.length === 0) return ask;
	return `“${name}” brings ${dangers.length === 1 ? 'a safety finding' : `${dangers.length} safety findings`} the current build does not have:\n\n${dangers.map((d) => `✕ ${d}`).join('\n')}\n\n${ask}`;
}

/**
 * Installs a plan, accepting the danger findings the installer was already shown. When the server
 * finds others (the plan or the head changed since they looked), it answers 409 with them: they
 * are named in a second question, and the install goes ahead only on a yes. Null: not installed.
 */
export async function installConfirmed<T>(
	run: (acceptDangers: string[]) => Promise<T>,
	name: string,
	shown: readonly AddedDanger[],
	confirm: (question: string) => boolean = (q) => window.confirm(q),
): Promise<T | null> {
	try {
		return await run(shown.map((d) => d.key));
	} catch (e) {
		if (!(e instanceof ApiError) || e.code !== 'confirm_findings') throw e;
		const findings = (e.body.findings ?? []) as AddedDanger[];
		if (
			!confirm(
				installQuestion(
					name,
					findings.map((f) => f.message),
				),
			)
		)
			return null;
		return run(findings.map((f) => f.key));
	}
}
