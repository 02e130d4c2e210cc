import type { ComponentType } from 'react';
import type { Vec3 } from '@shared/schemas/station';

/**
 * The 3D scene's drawing pieces, as features that draw into the scene receive them: the screen
 * that composes the scene hands them in, since features do not import each other.
 */
export interface ScenePieces {
  PathLine: ComponentType<{ points: readonly Vec3[]; color?: string; width?: number; dashed?: boolean }>;
  Marker: ComponentType<{ position: Vec3; label?: string; number?: number; color?: string; size?: number }>;
  TranslucentSphere: ComponentType<{
    center: Vec3;
    radius: number;
    color?: string;
    opacity?: number;
    wire?: boolean;
  }>;
}
