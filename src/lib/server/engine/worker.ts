import { ENGINE_TASKS, type EngineTask } from './tasks';

/** A worker thread of the engine pool: runs one task and answers what it returns. */
export default function run({ task, args }: { task: EngineTask; args: never }): unknown {
	return ENGINE_TASKS[task](args);
}
