import { describe, expect, it } from "vitest"
import * as seal from "@/lib/record/seal"
import { generateDrive } from "@/lib/tracks"

describe("canonical JSON (RFC 8785, JSON Canonicalization Scheme)", () => {
  it("orders properties by UTF-16 code units and writes numbers the ECMAScript way (RFC 8785 section 3.2.2 example)", () => {
    // RFC 8785 section 3.2.2: the input of the example and its canonical output.
    const input = {
      numbers: [333333333.33333329, 1e30, 4.5, 2e-3, 0.000000000000000000000000001],
      string: "\u20ac$\u000f\u000aA'\u0042\u0022\u005c\\\"/",
      literals: [null, true, false],
    }
    expect(seal.canonicalJson(input)).toBe(
      '{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}',
    )
  })

  it("sorts keys by UTF-16 code units, not by code point (RFC 8785 section 3.2.3 example)", () => {
    // RFC 8785 section 3.2.3: the sorted order of the example's property names.
    const input = {
      "\u20ac": "Euro Sign",
      "\r": "Carriage Return",
      "\ufb33": "Hebrew Letter Dalet With Dagesh",
      "1": "One",
      "\ud83d\ude00": "Emoji: Grinning Face",
      "\u0080": "Control",
      "\u00f6": "Latin Small Letter O With Diaeresis",
    }
    const keys = Object.keys(JSON.parse(seal.canonicalJson(input)) as object)
    const order = [...seal.canonicalJson(input).matchAll(/"([^"]*)":"([^"]*)"/g)].map((m) => m[2])
    expect(keys).toHaveLength(7)
    expect(order).toEqual([
      "Carriage Return",
      "One",
      "Control",
      "Latin Small Letter O With Diaeresis",
      "Euro Sign",
      "Emoji: Grinning Face",
      "Hebrew Letter Dalet With Dagesh",
    ])
  })

  it("drops undefined properties and keeps arrays in order, as JSON does on the wire", () => {
    expect(seal.canonicalJson({ b: 1, a: undefined, c: [3, 1, 2] })).toBe('{"b":1,"c":[3,1,2]}')
  })
})

describe("SHA-256 (FIPS 180-4)", () => {
  it('hashes "abc" to the published value (NIST FIPS 180-4 example, SHA256.pdf "One-Block Message")', () => {
    expect(seal.sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad")
  })

  it('hashes the two-block message to the published value (NIST example "Two-Block Message")', () => {
    expect(seal.sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq")).toBe(
      "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1",
    )
  })

  it("hashes the empty string to the published value (NIST CAVP SHA256ShortMsg, Len = 0)", () => {
    expect(seal.sha256Hex("")).toBe("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855")
  })
})

describe("the record digest and its verification code", () => {
  const base = {
    driveId: "6F1E8C2A-0B7D-4E55-9A3C-1D2E3F405162",
    revision: 1,
    driveFile: {
      format: "straightaway.drive/1",
      profile: { minSpeedMph: 35 },
      samples: [{ t: 1, lat: 40, lon: -75 }],
      marks: [],
    },
    score: { verdict: "met", reasons: [] },
    review: null,
  }

  it("is SHA-256 over the canonical record, whatever the order of the properties", () => {
    const shuffled = {
      ...base,
      driveFile: {
        marks: [],
        samples: [{ lon: -75, lat: 40, t: 1 }],
        profile: { minSpeedMph: 35 },
        format: "straightaway.drive/1",
      },
    }
    expect(seal.canonicalRecord(base)).toBe(
      '{"driveFile":{"format":"straightaway.drive/1","marks":[],"profile":{"minSpeedMph":35},"samples":[{"lat":40,"lon":-75,"t":1}]},"driveId":"6f1e8c2a-0b7d-4e55-9a3c-1d2e3f405162","format":"straightaway.record/1","review":null,"revision":1,"score":{"reasons":[],"verdict":"met"}}',
    )
    expect(seal.recordDigest(shuffled)).toBe(seal.sha256Hex(seal.canonicalRecord(base)))
  })

  it("writes a drive file exactly as the generic RFC 8785 canonicalizer does, samples with and without speed and accuracy", () => {
    const file = generateDrive({ seed: 5, minutes: 8, pattern: "short" })
    const mixed = {
      ...file,
      samples: file.samples.map((s, i) =>
        i % 3 === 0 ? { t: s.t, lat: s.lat, lon: s.lon } : i % 3 === 1 ? { ...s, speed: -0, accuracy: 1e21 } : s,
      ),
    }
    for (const f of [file, mixed, { ...file, samples: [{ t: 1, lat: 2, lon: 3, heading: 4 }] }, { format: "x" }]) {
      expect(seal.canonicalDriveFile(f)).toBe(seal.canonicalJson(f))
    }
    const full = {
      format: "straightaway.record/1",
      driveId: base.driveId.toLowerCase(),
      revision: 3,
      driveFile: mixed,
      score: base.score,
      review: { decision: "redo", note: "Ä note" },
    }
    expect(
      seal.canonicalRecord({ ...base, revision: 3, driveFile: mixed, review: { decision: "redo", note: "Ä note" } }),
    ).toBe(seal.canonicalJson(full))
  })

  it("changes with the revision number, the review and any sample", () => {
    const d = seal.recordDigest(base)
    expect(seal.recordDigest({ ...base, revision: 2 })).not.toBe(d)
    expect(seal.recordDigest({ ...base, review: { decision: "approve", note: "" } })).not.toBe(d)
    expect(
      seal.recordDigest({ ...base, driveFile: { ...base.driveFile, samples: [{ t: 1, lat: 40, lon: -75.0000001 }] } }),
    ).not.toBe(d)
  })

  it("makes a 12-character Crockford base-32 code from the first 60 bits of the digest", () => {
    // 0x000000000000000 -> twelve zeros; 0xfffffffffffffff -> twelve Z (31 = Z in Crockford's alphabet)
    expect(seal.verificationCode("0".repeat(64))).toBe("0000-0000-0000")
    expect(seal.verificationCode("f".repeat(64))).toBe("ZZZZ-ZZZZ-ZZZZ")
    // 0x0123456789abcde in base 32 is 0 4 17 20 10 25 28 9 21 15 6 30 (worked out separately with Python's integers)
    expect(seal.verificationCode(`0123456789abcde${"0".repeat(49)}`)).toBe("04HM-ASW9-NF6Y")
  })

  it("reads a typed code whatever its case, spacing and look-alike letters", () => {
    expect(seal.normalizeCode("04hm asw9 nf6y")).toBe("04HM-ASW9-NF6Y")
    expect(seal.normalizeCode("04HM-ASW9-NF6Y")).toBe("04HM-ASW9-NF6Y")
    expect(seal.normalizeCode("O0IL-0000-0000")).toBe("0011-0000-0000")
    expect(seal.normalizeCode("04HM-ASW9-NF6")).toBeNull()
    expect(seal.normalizeCode("04HM-ASW9-NF6U")).toBeNull()
  })
})
