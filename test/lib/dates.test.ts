import { describe, expect, it } from "vitest";
import { formatDay, formatMoment, isTimeZone, timeZoneChoices, todayIso } from "~/lib/dates";
import { invitationEmail } from "~/lib/emails";

// 2026-12-03 03:30 UTC: still the evening of 2 December on the American east coast, and already the
// afternoon of 3 December in Auckland (New York UTC−5 in winter, Auckland UTC+13 in summer: the IANA zone rules).
const late = new Date("2026-12-03T03:30:00Z");

describe("the shop's clock", () => {
  it("takes today in the shop's time zone", () => {
    expect(todayIso(late)).toBe("2026-12-03");
    expect(todayIso(late, "America/New_York")).toBe("2026-12-02");
    expect(todayIso(late, "Pacific/Auckland")).toBe("2026-12-03");
    expect(todayIso(new Date("2026-12-02T11:30:00Z"), "Pacific/Auckland")).toBe("2026-12-03");
  });

  it("shows days and moments where the shop is, naming the zone", () => {
    expect(formatDay(late.toISOString())).toBe("3 Dec 2026");
    expect(formatDay(late.toISOString(), "America/New_York")).toBe("2 Dec 2026");
    expect(formatMoment(late.toISOString())).toBe("3 Dec 2026, 03:30 UTC");
    expect(formatMoment(late.toISOString(), "America/New_York")).toBe("2 Dec 2026, 22:30 GMT-5");
    expect(formatMoment("2027-07-01T12:00:00Z", "Europe/London")).toBe("1 Jul 2027, 13:00 BST");
  });

  it("knows the zones this server knows, and nothing else", () => {
    for (const zone of ["UTC", "Europe/London", "America/Argentina/Buenos_Aires", "Etc/GMT+5"]) expect(isTimeZone(zone), zone).toBe(true);
    for (const bad of ["", "Mars/Olympus", "+01:00", "Europe/London; drop", "europe"]) expect(isTimeZone(bad), bad).toBe(false);
    const zones = timeZoneChoices();
    expect(zones[0]).toBe("UTC");
    expect(zones).toContain("Europe/London");
    expect(zones.every(isTimeZone)).toBe(true);
  });
});

describe("the invitation e-mail's expiry", () => {
  it("is told on the shop's clock", () => {
    const mail = (timeZone?: string) => invitationEmail({ shopName: "Tallowmere", inviterName: "Edda", role: "sawyer", link: "http://x/invitation/t", expiresAt: new Date("2027-07-01T12:00:00Z"), timeZone }).text;
    expect(mail("Europe/London")).toContain("The link works once and until 1 Jul 2027, 13:00 BST.");
    expect(mail()).toContain("The link works once and until 1 Jul 2027, 12:00 UTC.");
  });
});
