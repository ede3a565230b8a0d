import { AttributeIds, BrowseDirection, NodeClassMask, StatusCodes, type ClientSession, type DataValue } from 'node-opcua-client'
import type { VariableFacts } from '#shared/opcua/browsedNode'

// What a plant variable tells about itself, so a tag made from it starts with the plant's own
// words, unit and range: its Description attribute, and the EngineeringUnits and EURange
// properties an AnalogItem carries (IEC 62541-8 §5.3.2). Read with Browse and Read only.

const PROPERTY_NAMES = ['EngineeringUnits', 'EURange'] as const

/** The facts of each variable by node id; a variable whose reads fail gets nulls, never an error. */
export async function readVariableFacts(session: ClientSession, nodeIds: string[]): Promise<Map<string, VariableFacts>> {
  const facts = new Map<string, VariableFacts>()
  if (nodeIds.length === 0) return facts
  const properties = await session.browse(nodeIds.map(nodeId => ({
    nodeId, browseDirection: BrowseDirection.Forward, referenceTypeId: 'HasProperty', includeSubtypes: true,
    nodeClassMask: NodeClassMask.Variable, resultMask: 0x3f,
  })))
  // One Read for all: each variable's Description, then the value of each property found.
  const reads: { nodeId: string, attributeId: number, of: string, what: 'description' | (typeof PROPERTY_NAMES)[number] }[] = []
  nodeIds.forEach((nodeId, i) => {
    reads.push({ nodeId, attributeId: AttributeIds.Description, of: nodeId, what: 'description' })
    for (const ref of properties[i]?.references ?? []) {
      const name = PROPERTY_NAMES.find(n => n === ref.browseName.name)
      if (name) reads.push({ nodeId: ref.nodeId.toString(), attributeId: AttributeIds.Value, of: nodeId, what: name })
    }
  })
  const values = await session.read(reads.map(({ nodeId, attributeId }) => ({ nodeId, attributeId })))
  for (const nodeId of nodeIds) facts.set(nodeId, { description: null, engineeringUnit: null, rangeLow: null, rangeHigh: null })
  reads.forEach((read, i) => {
    const value = goodValue(values[i])
    if (value === undefined) return
    const entry = facts.get(read.of)!
    if (read.what === 'description') entry.description = textOf(value)
    else if (read.what === 'EngineeringUnits') entry.engineeringUnit = textOf((value as { displayName?: unknown }).displayName)
    else {
      const range = value as { low?: unknown, high?: unknown }
      if (Number.isFinite(range.low) && Number.isFinite(range.high)) {
        entry.rangeLow = range.low as number
        entry.rangeHigh = range.high as number
      }
    }
  })
  return facts
}

function goodValue(dataValue: DataValue | undefined): unknown {
  if (!dataValue || !dataValue.statusCode.equals(StatusCodes.Good)) return undefined
  return dataValue.value?.value ?? undefined
}

/** A LocalizedText's text, or null when empty. */
function textOf(value: unknown): string | null {
  const text = (value as { text?: unknown } | null)?.text
  return typeof text === 'string' && text.trim() !== '' ? text.trim() : null
}
