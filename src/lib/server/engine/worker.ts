import { ENGINE_TASKS, type EngineTask } from './tasks';

/** A worker thread of the engine pool: runs one task and answers its JSON. */
export default function run({ task, args }: { task: EngineTask; args: never }): string {
	return ENGINE_TASKS[task](args);
}
