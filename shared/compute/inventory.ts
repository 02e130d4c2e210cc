import { AIRLOCK_LOCATION, type ManifestItem, type Task } from '../schemas/plan';

export type InventoryItem = Pick<ManifestItem, 'name' | 'kind' | 'carriedBy' | 'endsAt'> & {
  id?: number;
  startsAt?: string;
};
export type InventoryTask = Pick<Task, 'title' | 'crew' | 'tools'>;

export interface InventoryStation {
  /** the airlock's node key: `endsAt` may name it instead of `airlock` */
  airlockKey?: string;
  hasNode: (key: string) => boolean;
}

export type InventoryWarningCode =
  | 'missing-end'
  | 'unknown-end'
  | 'unknown-start'
  | 'tool-not-in-manifest'
  | 'carrier-not-on-task'
  | 'unused-tool';

export interface InventoryWarning {
  code: InventoryWarningCode;
  message: string;
  /** the manifest item's name */
  item?: string;
  itemIndex?: number;
  taskIndex?: number;
}

/** Tool names match whatever their case and spacing: "Torque  wrench" is "torque wrench". */
const nameKey = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

/**
 * The end-of-day inventory: everything taken out comes back or is stowed at a named place.
 *
 * - `missing-end`: an item has no end location.
 * - `unknown-end` / `unknown-start`: a location is neither `airlock`, the airlock's key, nor a node
 *   of the station (checked only when the station is given).
 * - `tool-not-in-manifest`: a task uses a tool no manifest item is named after (one warning per
 *   task and tool).
 * - `carrier-not-on-task`: a tool is carried by a crew member who does none of the tasks using it
 *   (a `both` task counts for each). Each manifest item is judged on its own, so when EV1 and EV2
 *   each carry one, only the idle one is flagged.
 * - `unused-tool`: a tool no task uses. Bags are exempt: tasks name what is in them, not the bag.
 */
export function checkInventory(
  manifest: readonly InventoryItem[],
  tasks: readonly InventoryTask[],
  station?: InventoryStation,
): InventoryWarning[] {
  const warnings: InventoryWarning[] = [];
  const knownLocation = (key: string) =>
    key === AIRLOCK_LOCATION || key === station?.airlockKey || !station || station.hasNode(key);

  manifest.forEach((item, itemIndex) => {
    const ref = { item: item.name, itemIndex };
    if (item.endsAt === undefined || item.endsAt === '') {
      warnings.push({
        code: 'missing-end',
        message: `${item.name} (${item.carriedBy}) has no end location: bring it back to the airlock or name where it is stowed`,
        ...ref,
      });
    } else if (!knownLocation(item.endsAt)) {
      warnings.push({
        code: 'unknown-end',
        message: `${item.name} (${item.carriedBy}) ends at "${item.endsAt}", which is not the airlock or a node of the station`,
        ...ref,
      });
    }
    if (item.startsAt !== undefined && !knownLocation(item.startsAt)) {
      warnings.push({
        code: 'unknown-start',
        message: `${item.name} (${item.carriedBy}) starts at "${item.startsAt}", which is not the airlock or a node of the station`,
        ...ref,
      });
    }
  });

  const inManifest = new Set(manifest.map((m) => nameKey(m.name)));
  tasks.forEach((task, taskIndex) => {
    for (const tool of new Set(task.tools.map(nameKey))) {
      if (!inManifest.has(tool)) {
        warnings.push({
          code: 'tool-not-in-manifest',
          message: `Task ${taskIndex + 1} "${task.title}" uses ${task.tools.find((t) => nameKey(t) === tool)}, which is not in the manifest`,
          taskIndex,
        });
      }
    }
  });

  manifest.forEach((item, itemIndex) => {
    if (item.kind !== 'tool') return;
    const key = nameKey(item.name);
    const users = tasks.filter((t) => t.tools.some((tool) => nameKey(tool) === key));
    const ref = { item: item.name, itemIndex };
    if (users.length === 0) {
      warnings.push({
        code: 'unused-tool',
        message: `${item.name} (${item.carriedBy}) is used by no task`,
        ...ref,
      });
    } else if (!users.some((t) => t.crew === 'both' || t.crew === item.carriedBy)) {
      const who = [...new Set(users.map((t) => t.crew))].join(', ');
      warnings.push({
        code: 'carrier-not-on-task',
        message: `${item.name} is carried by ${item.carriedBy}, but only ${who} does the tasks that use it`,
        ...ref,
      });
    }
  });

  return warnings;
}
