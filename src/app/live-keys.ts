import type { QueryKey } from '@tanstack/react-query';
import type { ChangeEvent } from '@shared/schemas/events';
import { activityKeys } from '@/features/activity/api/get-activity';
import { annotationKeys } from '@/features/annotations/api/keys';
import { planKeys } from '@/features/plans/api/keys';
import { runKeys } from '@/features/runs/api/keys';
import { seriesKeys } from '@/features/series/api/get-series';
import { stationKeys } from '@/features/stations/api/keys';
import { walkthroughKeys } from '@/features/walkthrough/api/keys';

/**
 * The cached queries a change on the live stream makes stale. Computed routes and socket plans are
 * keyed by station version, so a station change reaches them through the station it refetches.
 */
export function staleKeysOf(change: ChangeEvent): QueryKey[] {
  const keys: QueryKey[] = [activityKeys.all];
  switch (change.kind) {
    case 'plan':
      // a plan's day shows in its walkthroughs and its series too
      keys.push(planKeys.lists(), planKeys.detail(change.id), walkthroughKeys.all, seriesKeys.all);
      break;
    case 'station':
      // every plan's day on the station is computed on its model
      keys.push(stationKeys.all, planKeys.all, annotationKeys.list(change.id), walkthroughKeys.all);
      break;
    case 'run':
      // what a run logs is what the task form offers as flown estimates on its plan's station
      keys.push(
        runKeys.detail(change.id),
        change.planId === undefined ? runKeys.all : runKeys.ofPlan(change.planId),
        planKeys.allFlownEstimates(),
      );
      break;
    case 'annotation':
      keys.push(annotationKeys.all);
      break;
    case 'walkthrough':
      keys.push(walkthroughKeys.all);
      break;
    case 'series':
      keys.push(seriesKeys.all, planKeys.all);
      break;
  }
  return keys;
}
