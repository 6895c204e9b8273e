// Replies of the build-space routes (docs/api.md, "Build spaces"). None carries a price: a
// builder reads them.
import type { MeasuredRun, RigCalibration } from '../schemas/build'
import type { SheetInputs } from '../schemas/planner'
import type { ChecklistStep, SheetVerdict } from '../utils/build'
import type { OrderStatus } from '../utils/order-flow'
import type { Rig } from '../utils/planner/schema'

/** The order a build space belongs to, as everyone in it may see it. */
export interface BuildSpaceRef {
  orderId: number
  orderNumber: string
  schoolName: string
  /** The teacher who placed the order (the adult in charge). */
  teacherName: string
}

/** A member of a build space: a display name and a username, nothing more about a student. */
export interface BuildMember {
  id: number
  name: string
  username: string | null
  rigId: number | null
  joinedAt: string
}

export interface ChecklistEntry {
  step: ChecklistStep
  done: boolean
  doneAt: string | null
  doneBy: string | null
  note: string | null
  updatedAt: string | null
  updatedBy: string | null
}

/** A tuning sheet in a rig's history. */
export interface RigSheet {
  id: number
  title: string
  note: string | null
  authorName: string
  createdAt: string
  verdict: SheetVerdict | null
  measured: MeasuredRun | null
  inputs: SheetInputs
  stable: boolean | null
  phaseMarginDeg: number | null
  overshootPct: number | null
  settlingTime: number | null
}

/** What the caller may do on the rig page (the server checks every one again). */
export interface RigPermissions {
  /** Rename, regroup, retire, move builders: the order's teacher. */
  manage: boolean
  /** Tick steps, save dimensions, calibration and sheets: the teacher and the space's builders. */
  work: boolean
}

/** GET /api/rigs/:id and every rig change. */
export interface RigView {
  id: number
  serial: string
  /** The teacher's name for it, or the serial. */
  name: string
  groupLabel: string | null
  retired: boolean
  space: BuildSpaceRef
  builders: BuildMember[]
  checklist: ChecklistEntry[]
  currentStep: ChecklistStep | null
  dimensions: Rig | null
  dimensionsUpdatedAt: string | null
  calibration: RigCalibration | null
  calibratedAt: string | null
  /** Newest first. */
  sheets: RigSheet[]
  lastActivityAt: string | null
  may: RigPermissions
}

/** One rig on the progress board. */
export interface BoardRig {
  id: number
  serial: string
  name: string
  groupLabel: string | null
  retired: boolean
  builders: BuildMember[]
  done: number
  total: number
  currentStep: ChecklistStep | null
  /** When the rig reached its current step. */
  currentSince: string | null
  stuck: boolean
  latestSheet: {
    id: number
    title: string
    createdAt: string
    verdict: SheetVerdict | null
    stable: boolean | null
  } | null
  lastActivityAt: string | null
}

export interface JoinCodeView {
  id: number
  /** As stored; show it with formatJoinCode(). */
  code: string
  expiresAt: string
  maxUses: number | null
  uses: number
  revokedAt: string | null
  createdAt: string
  /** Works now: not revoked, not expired, not used up. */
  live: boolean
}

/** GET /api/orders/:id/board: the board, filtered and sorted on the server. */
export interface BoardReply {
  space: BuildSpaceRef
  /** When the build space opened (the order was paid or its purchase order approved). */
  openedAt: string
  rigs: BoardRig[]
  /** Every rig of the space before filtering, for the counts above the board. */
  totals: { rigs: number, finished: number, stuck: number, retired: number }
  /** Every group label in use, for the filter. */
  groups: string[]
  members: BuildMember[]
  /** The teacher's join codes, newest first (empty for staff). */
  joinCodes: JoinCodeView[]
  /** The server's clock when this was read: the board's "updated" time. */
  updatedAt: string
}

/** POST /api/orders/:id/join-codes (201). */
export interface JoinCodeCreated {
  code: string
  expiresAt: string
}

/** POST /api/join/check: the code works; who it lets the student join, and a username idea. */
export interface JoinCheckReply {
  space: Pick<BuildSpaceRef, 'schoolName' | 'teacherName' | 'orderNumber'>
  suggestedUsername: string
}

/** POST /api/orders/:id/builders/:userId/password: shown once to the teacher. */
export interface BuilderPasswordReply {
  username: string | null
  password: string
}

/** GET /api/build-spaces: the spaces the caller teaches or builds in, with a progress summary. */
export interface BuildSpaceSummary extends BuildSpaceRef {
  status: OrderStatus
  openedAt: string
  rigs: number
  finished: number
  stuck: number
  /** The caller's own rigs (a builder's; empty for a teacher). */
  myRigs: SpaceRig[]
  /** Every rig of the space in use, which its builders may all open (empty for a teacher). */
  classRigs: SpaceRig[]
}

/** A rig as a builder's list shows it. */
export interface SpaceRig {
  id: number
  serial: string
  name: string
  groupLabel: string | null
  currentStep: ChecklistStep | null
}
