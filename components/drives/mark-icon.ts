import {
  Ban,
  Car,
  CarFront,
  CheckCheck,
  CircleCheck,
  CircleStop,
  MessageSquare,
  MoveHorizontal,
  type LucideIcon,
} from "lucide-react"

/** One icon per mark kind, so a mark never relies on colour alone (chart, timeline). */
export const MARK_ICON: Record<string, LucideIcon> = {
  "lead-on": CarFront,
  gap: MoveHorizontal,
  "lead-off": Car,
  cleared: CheckCheck,
  stopped: CircleStop,
  verified: CircleCheck,
  "verify-failed": Ban,
  note: MessageSquare,
}
