package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.DayOfWeek;
import java.time.Duration;
import java.time.Instant;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.LocalTime;
import java.time.ZoneId;
import java.time.zone.ZoneOffsetTransition;
import java.time.zone.ZoneRules;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * A zone's hours: the weekly ranges and off dates worked out by hand on plain weeks, and across both daylight-saving
 * changes of 2026 in two real time zones (one per hemisphere) against the transitions of the JDK's tz database
 * ({@link ZoneRules}), the outside reference for when a wall time is which instant.
 */
class ZoneHoursTest {
    private static final ZoneId BERLIN = ZoneId.of("Europe/Berlin");
    /** A Monday in winter (UTC+01:00 in Berlin), a plain week with no change of offset. */
    private static final LocalDate MONDAY = LocalDate.of(2026, 12, 7);

    private static ZoneHours hours(ZoneId zone, List<LocalDate> off, String... ranges) {
        List<ZoneHours.Range> rs = new ArrayList<>();
        for (String r : ranges) {
            rs.add(ZoneHours.parseRange(r));
        }
        return new ZoneHours(zone, rs, off);
    }

    /** The instant of a Berlin wall time on a plain winter day (offset +01:00, from memory; checked below). */
    private static Instant berlin(LocalDate d, String time) {
        return LocalDateTime.of(d, LocalTime.parse(time)).atZone(BERLIN).toInstant();
    }

    @Test
    void theWeekIsWhatTheRangesSay() {
        assertEquals(DayOfWeek.MONDAY, MONDAY.getDayOfWeek());
        assertEquals("+01:00", BERLIN.getRules().getOffset(berlin(MONDAY, "12:00")).getId());
        ZoneHours h = hours(BERLIN, List.of(), "mon-fri 06:00-22:00", "Sat 07:00-12:00");
        assertEquals("mon-fri 06:00-22:00, sat 07:00-12:00", h.toString());
        assertFalse(h.on(berlin(MONDAY, "05:59")));
        assertTrue(h.on(berlin(MONDAY, "06:00")), "a range includes its start");
        assertTrue(h.on(berlin(MONDAY, "21:59")));
        assertFalse(h.on(berlin(MONDAY, "22:00")), "and excludes its end");
        assertTrue(h.on(berlin(MONDAY.plusDays(4), "12:00")), "friday");
        assertTrue(h.on(berlin(MONDAY.plusDays(5), "11:59")), "saturday morning");
        assertFalse(h.on(berlin(MONDAY.plusDays(5), "12:00")));
        assertFalse(h.on(berlin(MONDAY.plusDays(6), "12:00")), "sunday");
        assertEquals(berlin(MONDAY, "22:00"), h.nextChange(berlin(MONDAY, "12:00")));
        assertEquals(berlin(MONDAY.plusDays(1), "06:00"), h.nextChange(berlin(MONDAY, "22:00")));
        assertEquals(berlin(MONDAY.plusDays(5), "07:00"), h.nextChange(berlin(MONDAY.plusDays(4), "22:00")));
        assertEquals(berlin(MONDAY.plusDays(7), "06:00"), h.nextChange(berlin(MONDAY.plusDays(5), "12:00")),
                "from saturday noon over the weekend to monday");
        assertEquals("in hours until 2026-12-07T22:00+01:00 (mon-fri 06:00-22:00, sat 07:00-12:00)",
                h.describe(berlin(MONDAY, "12:00")));
        assertEquals("off hours until 2026-12-08T06:00+01:00 (outside hours mon-fri 06:00-22:00, sat 07:00-12:00)",
                h.describe(berlin(MONDAY, "23:00")));
    }

    @Test
    void aNightRangeBelongsToTheDayItStartsAndDayRangesWrap() {
        ZoneHours h = hours(BERLIN, List.of(), "fri-mon 22:00-06:00");
        assertFalse(h.on(berlin(MONDAY.plusDays(4), "21:59")), "friday evening");
        assertTrue(h.on(berlin(MONDAY.plusDays(4), "22:00")));
        assertTrue(h.on(berlin(MONDAY.plusDays(5), "05:59")), "saturday morning is friday's night");
        assertFalse(h.on(berlin(MONDAY.plusDays(5), "06:00")));
        assertTrue(h.on(berlin(MONDAY.plusDays(6), "23:00")), "sunday night");
        assertTrue(h.on(berlin(MONDAY, "03:00")), "monday morning is sunday's night");
        assertTrue(h.on(berlin(MONDAY, "23:00")), "monday night: the range wraps from friday to monday");
        assertTrue(h.on(berlin(MONDAY.plusDays(1), "05:00")), "tuesday morning is monday's night");
        assertFalse(h.on(berlin(MONDAY.plusDays(1), "23:00")), "tuesday night is not in the range");
        assertEquals(berlin(MONDAY.plusDays(1), "06:00"), h.nextChange(berlin(MONDAY, "23:00")));
        assertEquals(berlin(MONDAY.plusDays(4), "22:00"), h.nextChange(berlin(MONDAY.plusDays(1), "06:00")));
    }

    @Test
    void theWholeWeekNeverChangesAndOffDatesTurnWholeDaysOff() {
        ZoneHours always = hours(BERLIN, List.of(), "mon-sun 00:00-24:00");
        assertTrue(always.on(berlin(MONDAY, "00:00")));
        assertNull(always.nextChange(berlin(MONDAY, "12:00")), "never changes");
        assertEquals("in hours from now on (mon-sun 00:00-24:00)", always.describe(berlin(MONDAY, "12:00")));

        LocalDate eve = LocalDate.of(2026, 12, 24);
        ZoneHours h = hours(BERLIN, List.of(eve.plusDays(1), eve), "mon-sun 00:00-24:00");
        assertEquals(List.of(eve, eve.plusDays(1)), h.offDates(), "in order");
        assertTrue(h.on(berlin(eve.minusDays(1), "23:59")));
        assertFalse(h.on(berlin(eve, "00:00")));
        assertFalse(h.on(berlin(eve.plusDays(1), "23:59")));
        assertTrue(h.on(berlin(eve.plusDays(2), "00:00")));
        assertEquals(berlin(eve, "00:00"), h.nextChange(berlin(eve.minusDays(1), "12:00")));
        assertEquals(berlin(eve.plusDays(2), "00:00"), h.nextChange(berlin(eve, "00:00")),
                "two off dates in a row are one stretch off hours");
        assertEquals("off date 2026-12-25", h.offReason(berlin(eve.plusDays(1), "10:00")));
        assertNull(h.nextChange(berlin(eve.plusDays(2), "00:00")), "no change after the last off date");
        // an off date far ahead is still found
        ZoneHours later = hours(BERLIN, List.of(LocalDate.of(2027, 12, 24)), "mon-sun 00:00-24:00");
        assertEquals(berlin(LocalDate.of(2027, 12, 24), "00:00"), later.nextChange(berlin(MONDAY, "12:00")));
    }

    @Test
    void aNightRangeThatStartsOnAnOffDateIsOffToItsEnd() {
        LocalDate eve = LocalDate.of(2026, 12, 24);
        ZoneHours h = hours(BERLIN, List.of(eve), "mon-sun 22:00-06:00");
        assertTrue(h.on(berlin(eve.minusDays(1), "23:00")), "the night of the 23rd, up to midnight...");
        assertFalse(h.on(berlin(eve, "00:00")), "...but not into the off date, which is off all day");
        assertFalse(h.on(berlin(eve, "05:00")));
        assertEquals("off date 2026-12-24", h.offReason(berlin(eve, "05:00")));
        assertFalse(h.on(berlin(eve.plusDays(1), "05:00")), "the off date's own night, past midnight");
        assertEquals("off date 2026-12-24", h.offReason(berlin(eve.plusDays(1), "05:00")));
        assertTrue(h.on(berlin(eve.plusDays(1), "22:00")));
        assertEquals(berlin(eve, "00:00"), h.nextChange(berlin(eve.minusDays(1), "23:59")));
        assertEquals(berlin(eve.plusDays(1), "22:00"), h.nextChange(berlin(eve, "00:00")));
        assertEquals("outside hours mon-sun 22:00-06:00", h.offReason(berlin(eve.plusDays(1), "12:00")));
    }

    @ParameterizedTest
    @ValueSource(strings = {"mon-fri 6:00-22:00", "mo 06:00-22:00", "mon-fri 06:00", "mon-fri  ", "06:00-22:00",
        "mon-fri 06:00-22:60", "mon-fri 24:00-06:00", "mon-fri 06:00-24:30", "mon-xyz 06:00-22:00",
        "mon-tue-wed 06:00-22:00", "mon 06:00-22:00 extra"})
    void malformedRangesAreRefusedWithWhatIsExpected(String range) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ZoneHours.parseRange(range));
        assertEquals(ZoneHours.RANGE_EXPECTED, e.getMessage());
    }

    @Test
    void anEmptyTimeRangeIsRefused() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ZoneHours.parseRange("mon 06:00-06:00"));
        assertTrue(e.getMessage().startsWith("a time range that is not empty"), e.getMessage());
        assertEquals(24 * 60, ZoneHours.parseRange("mon 22:00-00:00").endMinute(), "00:00 as an end is 24:00");
    }

    /** Both changes of 2026 in Berlin (spring gap 29 March, autumn overlap 25 October) and Sydney (5 April, 4 October). */
    private static List<ZoneOffsetTransition> changes2026(ZoneId zone) {
        ZoneRules rules = zone.getRules();
        ZoneOffsetTransition first = rules.nextTransition(Instant.parse("2026-01-01T00:00:00Z"));
        ZoneOffsetTransition second = rules.nextTransition(first.getInstant());
        assertTrue(first.getInstant().isBefore(Instant.parse("2027-01-01T00:00:00Z")));
        assertTrue(second.getInstant().isBefore(Instant.parse("2027-01-01T00:00:00Z")));
        assertTrue(first.isGap() != second.isGap(), "one gap and one overlap a year");
        return List.of(first, second);
    }

    /** A range on the change's day, e.g. "sun 01:00-04:00". */
    private static String onDay(ZoneOffsetTransition c, String times) {
        return c.getDateTimeBefore().getDayOfWeek().getDisplayName(java.time.format.TextStyle.SHORT, Locale.ROOT)
                .toLowerCase(Locale.ROOT) + " " + times;
    }

    /** The instant of a wall time on the change's day read with the offset before or after it (tz database). */
    private static Instant wall(ZoneOffsetTransition c, String time, boolean after) {
        return LocalDateTime.of(c.getDateTimeBefore().toLocalDate(), LocalTime.parse(time))
                .toInstant(after ? c.getOffsetAfter() : c.getOffsetBefore());
    }

    @ParameterizedTest
    @ValueSource(strings = {"Europe/Berlin", "Australia/Sydney"})
    void aRangeAcrossAChangeLastsItsRealElapsedTime(String id) {
        ZoneId zone = ZoneId.of(id);
        for (ZoneOffsetTransition c : changes2026(zone)) {
            // both zones change between 02:00 and 03:00 local time (tz database), so 01:00 is before and 04:00 after
            assertTrue(c.getDateTimeBefore().toLocalTime().getHour() >= 2 && c.getDateTimeAfter().toLocalTime().getHour() <= 3, c.toString());
            ZoneHours h = hours(zone, List.of(), onDay(c, "01:00-04:00"));
            Instant start = wall(c, "01:00", false);
            Instant end = wall(c, "04:00", true);
            assertEquals(start, h.nextChange(start.minus(Duration.ofHours(12))), id + " " + c);
            assertEquals(end, h.nextChange(start), id + " " + c);
            // 3 wall hours less the hour skipped in spring, plus the hour repeated in autumn
            Duration expected = Duration.ofHours(3).minus(c.getDuration());
            assertEquals(expected, Duration.between(start, end), id + " " + c);
            assertEquals(c.isGap() ? Duration.ofHours(2) : Duration.ofHours(4), expected);
            assertTrue(h.on(c.getInstant()) && h.on(c.getInstant().minusSeconds(1)), "on across the change itself");
            assertFalse(h.on(end));
        }
    }

    @ParameterizedTest
    @ValueSource(strings = {"Europe/Berlin", "Australia/Sydney"})
    void wallTimesInTheGapMoveForwardAndInTheOverlapTakeTheEarlierOffset(String id) {
        ZoneId zone = ZoneId.of(id);
        for (ZoneOffsetTransition c : changes2026(zone)) {
            ZoneHours h = hours(zone, List.of(), onDay(c, "02:30-05:00"));
            // gap: 02:30 does not exist and moves forward by the gap's length, i.e. 02:30 read with the old offset;
            // overlap: 02:30 happens twice and the earlier (the old offset) is taken. Either way: the old offset.
            Instant start = wall(c, "02:30", false);
            assertEquals(start, h.nextChange(start.minus(Duration.ofHours(12))), id + " " + c);
            // in the gap that is half an hour after the change; in the overlap the first 02:30, half an hour before
            assertEquals(c.getInstant().plus(Duration.ofMinutes(c.isGap() ? 30 : -30)), start, id + " " + c);
            assertEquals(wall(c, "05:00", true), h.nextChange(start), id + " " + c);
            assertFalse(h.on(start.minusSeconds(1)));
        }
    }

    @Test
    void anHourThatTheSpringChangeSkipsIsEmptyThatDay() {
        ZoneOffsetTransition spring = changes2026(BERLIN).get(0);
        assertTrue(spring.isGap());
        assertEquals(LocalDate.of(2026, 3, 29), spring.getDateTimeBefore().toLocalDate());
        ZoneHours h = hours(BERLIN, List.of(), "sun 02:00-03:00");
        for (int m = -90; m <= 90; m += 15) {
            assertFalse(h.on(spring.getInstant().plus(Duration.ofMinutes(m))), m + " min from the change");
        }
        // the next change is the following sunday's hour, which exists
        Instant saturday = spring.getInstant().minus(Duration.ofHours(20));
        assertEquals(LocalDateTime.of(2026, 4, 5, 2, 0).toInstant(spring.getOffsetAfter()), h.nextChange(saturday));
        // the sunday before still had it, an hour long
        Instant before = LocalDateTime.of(2026, 3, 22, 2, 0).toInstant(spring.getOffsetBefore());
        assertEquals(before.plus(Duration.ofHours(1)), h.nextChange(before));
    }

    @ParameterizedTest
    @ValueSource(strings = {"Europe/Berlin", "Australia/Sydney"})
    void aNightAcrossAChangeAndWeekdaysAcrossAWeekendWithAChange(String id) {
        ZoneId zone = ZoneId.of(id);
        for (ZoneOffsetTransition c : changes2026(zone)) {
            LocalDate sunday = c.getDateTimeBefore().toLocalDate();
            assertEquals(DayOfWeek.SUNDAY, sunday.getDayOfWeek(), "2026's changes fall on sundays (tz database)");
            ZoneHours night = hours(zone, List.of(), "sat 22:00-06:00");
            Instant start = LocalDateTime.of(sunday.minusDays(1), LocalTime.of(22, 0)).toInstant(c.getOffsetBefore());
            Instant end = wall(c, "06:00", true);
            assertEquals(start, night.nextChange(start.minus(Duration.ofHours(1))));
            assertEquals(end, night.nextChange(start));
            assertEquals(Duration.ofHours(8).minus(c.getDuration()), Duration.between(start, end), id + " " + c);

            ZoneHours weekdays = hours(zone, List.of(), "mon-fri 06:00-22:00");
            Instant friday = LocalDateTime.of(sunday.minusDays(2), LocalTime.of(22, 0)).toInstant(c.getOffsetBefore());
            Instant monday = LocalDateTime.of(sunday.plusDays(1), LocalTime.of(6, 0)).toInstant(c.getOffsetAfter());
            assertEquals(friday, weekdays.nextChange(friday.minus(Duration.ofHours(1))));
            assertEquals(monday, weekdays.nextChange(friday), id + " " + c);
            assertEquals(Duration.ofHours(56).minus(c.getDuration()), Duration.between(friday, monday));
        }
    }
}
