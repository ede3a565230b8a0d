// One node of a plant server's address space as the admin's browse answers it
// (server/services/opcua/addressSpaceBrowse.ts) and the picker shows it.

/** What a variable tells about itself, to fill in a tag made from it; null where the server offers none. */
export interface VariableFacts {
  description: string | null
  engineeringUnit: string | null
  rangeLow: number | null
  rangeHigh: number | null
}

export interface BrowsedNode {
  nodeId: string
  browseName: string
  displayName: string
  nodeClass: 'Object' | 'Variable'
  /** Set on variables only. */
  facts: VariableFacts | null
}
