// Closed sets of the plant model, shared by the schema CHECKs, the zod contracts and the screens.

/**
 * How a tag belongs to another tag's control loop. A tight loop holds its measured value still
 * and moves the controller output instead, so slowing down shows in the output (docs/science.md);
 * linking the two lets an engineer watch the tag where it shows.
 */
export const LOOP_ROLES = ['controller_output', 'setpoint'] as const
export type LoopRole = typeof LOOP_ROLES[number]

export const LOOP_ROLE_LABELS: Record<LoopRole, string> = {
  controller_output: 'controller output (manipulated variable)',
  setpoint: 'setpoint',
}
