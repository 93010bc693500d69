// VIN check digit and model-year code per 49 CFR Part 565 (check-digit calculation, year-code table,
// and the §565.15(b) position-7 rule). Pure: no I/O, never throws from checkVin.

const VIN_LENGTH = 17
const CHECK_DIGIT_POSITION = 9
const MODEL_YEAR_POSITION = 10

// 49 CFR 565, "Assigned Values" table. Digits keep their own value. I, O and Q have no value.
const LETTER_VALUES: Readonly<Record<string, number>> = {
  A: 1,
  B: 2,
  C: 3,
  D: 4,
  E: 5,
  F: 6,
  G: 7,
  H: 8,
  J: 1,
  K: 2,
  L: 3,
  M: 4,
  N: 5,
  P: 7,
  R: 9,
  S: 2,
  T: 3,
  U: 4,
  V: 5,
  W: 6,
  X: 7,
  Y: 8,
  Z: 9,
}

// 49 CFR 565, "VIN Position and Weight Factor" table, positions 1-17. Position 9 (the check digit) weighs 0.
export const POSITION_WEIGHTS: readonly number[] = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2]

// 49 CFR 565 year-code table: a 30-code cycle starting at 1980 (and again at 2010).
const MODEL_YEAR_CODES = "ABCDEFGHJKLMNPRSTVWXY123456789"
const NEVER_YEAR_CODES = ["U", "Z", "0"]

export type VinCheck = {
  vin: string
  valid: boolean
  checkDigit: string | null
  expectedCheckDigit: string | null
  modelYear: number | null
  /**
   * Every model year position 10 can mean that has come (up to next year). Two when position 7 cannot settle it:
   * the position-7 rule binds only cars, MPVs and trucks up to 4536 kg GVWR, so for a heavier truck, a bus, a
   * trailer or a motorcycle the other 30-year cycle stays possible. `modelYear` is the light-vehicle reading.
   */
  modelYearChoices: number[]
  problems: string[]
}

function normaliseVin(input: string): string {
  return typeof input === "string" ? input.trim().toUpperCase() : ""
}

/** The value a character carries in the check-digit sum, or null if it may not appear in a VIN. */
export function transliterate(char: string): number | null {
  if (char.length === 1 && char >= "0" && char <= "9") return Number(char)
  return LETTER_VALUES[char] ?? null
}

function isVinCharacter(char: string): boolean {
  return transliterate(char) !== null
}

/**
 * Weighted sum of a 17-character VIN. Position 9 is ignored (weight 0), so a placeholder such as "?" may
 * stand there. Throws RangeError if the VIN is not 17 characters or another position holds an illegal
 * character.
 */
export function computeWeightedSum(vin17: string): number {
  const chars = [...normaliseVin(vin17)]
  if (chars.length !== VIN_LENGTH) {
    throw new RangeError(`A VIN needs ${VIN_LENGTH} characters; got ${chars.length}.`)
  }
  let sum = 0
  chars.forEach((char, index) => {
    if (index === CHECK_DIGIT_POSITION - 1) return
    const value = transliterate(char)
    if (value === null) {
      throw new RangeError(`Position ${index + 1} holds ${describeChar(char)}, which a VIN cannot contain.`)
    }
    sum += value * POSITION_WEIGHTS[index]!
  })
  return sum
}

/** The check digit ("0"-"9" or "X") that position 9 must hold. Throws RangeError like computeWeightedSum. */
export function computeCheckDigit(vin17: string): string {
  // Integer remainder only: the decimal fractions in published tables are rounded.
  const remainder = computeWeightedSum(vin17) % 11
  return remainder === 10 ? "X" : String(remainder)
}

/** The VIN with position 9 set to its check digit. Used to make invented VINs for demo data. */
export function withCheckDigit(vin17: string): string {
  const chars = [...normaliseVin(vin17)]
  chars[CHECK_DIGIT_POSITION - 1] = computeCheckDigit(vin17)
  return chars.join("")
}

type YearDecode = { modelYear: number | null; problem: string | null }

function decodeYearFromChars(chars: string[]): YearDecode {
  if (chars.length !== VIN_LENGTH) return { modelYear: null, problem: null }
  const yearCode = chars[MODEL_YEAR_POSITION - 1]!
  const position7 = chars[6]!
  if (NEVER_YEAR_CODES.includes(yearCode)) {
    return {
      modelYear: null,
      problem: `Position 10 is ${yearCode}, which is not a model-year code (U, Z and 0 are never used there).`,
    }
  }
  const cycleIndex = MODEL_YEAR_CODES.indexOf(yearCode)
  // Other illegal characters (I, O, Q, punctuation) are already named by the character check.
  if (cycleIndex < 0 || !isVinCharacter(position7)) return { modelYear: null, problem: null }
  // 49 CFR 565.15(b): from MY2010 position 7 is alphabetic for cars, MPVs and trucks up to 4536 kg GVWR.
  // NOTE: heavier trucks, buses, trailers and motorcycles are not bound by this rule, so their year may
  // be 30 years off.
  const cycleStart = position7 >= "A" && position7 <= "Z" ? 2010 : 1980
  return { modelYear: cycleStart + cycleIndex, problem: null }
}

/**
 * The model years position 10 can stand for (both 30-year cycles of the 49 CFR 565 table) that are not in the
 * future: a model year may run at most one calendar year ahead. The light-vehicle reading (position 7) first.
 */
export function modelYearChoices(vin: string, thisYear = new Date().getUTCFullYear()): number[] {
  const chars = [...normaliseVin(vin)]
  const light = decodeYearFromChars(chars).modelYear
  if (light === null) return []
  const cycleIndex = MODEL_YEAR_CODES.indexOf(chars[MODEL_YEAR_POSITION - 1]!)
  const other = light >= 2010 ? 1980 + cycleIndex : 2010 + cycleIndex
  return [light, other].filter((y) => y <= thisYear + 1)
}

/** Model year from position 10, resolved with the position-7 rule; null if it cannot be decoded. */
export function decodeModelYear(vin: string): number | null {
  return decodeYearFromChars([...normaliseVin(vin)]).modelYear
}

export function checkVin(input: string): VinCheck {
  const vin = normaliseVin(input)
  const chars = [...vin]
  const problems: string[] = []

  if (chars.length === 0) {
    problems.push(`No VIN was entered; it needs ${VIN_LENGTH} characters.`)
  } else if (chars.length !== VIN_LENGTH) {
    problems.push(`VIN has ${chars.length} character${chars.length === 1 ? "" : "s"}; it needs ${VIN_LENGTH}.`)
  }

  const neverLetters: string[] = []
  const foreign: string[] = []
  chars.forEach((char, index) => {
    if (isVinCharacter(char)) return
    const where = `position ${index + 1} is ${describeChar(char)}`
    if (char === "I" || char === "O" || char === "Q") neverLetters.push(where)
    else foreign.push(where)
  })
  if (neverLetters.length > 0) {
    problems.push(`Letters I, O and Q are never used in a VIN (${neverLetters.join("; ")}).`)
  }
  if (foreign.length > 0) {
    problems.push(`A VIN holds only digits and capital letters (${foreign.join("; ")}).`)
  }

  let checkDigit: string | null = null
  let expectedCheckDigit: string | null = null
  if (chars.length === VIN_LENGTH) {
    checkDigit = chars[CHECK_DIGIT_POSITION - 1]!
    // Position 9 has weight 0, so the expected digit is known even when position 9 itself is mistyped.
    const othersLegal = chars.every((char, index) => index === CHECK_DIGIT_POSITION - 1 || isVinCharacter(char))
    if (othersLegal) {
      expectedCheckDigit = computeCheckDigit(vin)
      if (checkDigit !== expectedCheckDigit) {
        problems.push(
          `Position 9 is ${describeChar(checkDigit)} but the check digit works out to ${expectedCheckDigit}.`,
        )
      }
    }
  }

  const year = decodeYearFromChars(chars)
  if (year.problem) problems.push(year.problem)

  return {
    vin,
    valid: problems.length === 0,
    checkDigit,
    expectedCheckDigit,
    modelYear: year.modelYear,
    modelYearChoices: year.modelYear === null ? [] : modelYearChoices(vin),
    problems,
  }
}

function describeChar(char: string): string {
  if (char === " ") return "a space"
  if (/^\s$/u.test(char)) return "a blank"
  if (/^[A-Z0-9]$/.test(char)) return char
  return `"${char}"`
}
