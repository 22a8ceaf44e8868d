package wayward.analysis;

import java.time.DayOfWeek;
import java.time.Instant;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.LocalTime;
import java.time.ZoneId;
import java.time.ZonedDateTime;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.TreeSet;

/**
 * A zone's weekly hours in the site's time zone: when its rule may raise events. Immutable; any thread.
 *
 * <p>Each range is a day or a day range ({@code mon} … {@code sun}; a range may wrap past Sunday, {@code sat-mon}
 * is Saturday, Sunday and Monday) and a local wall-time range {@code HH:MM-HH:MM}. A range whose end is not after
 * its start ({@code 22:00-06:00}) crosses midnight and belongs to the day it starts; {@code 24:00} ends a day.
 * An off date is off hours for the whole local day, and so is a range that starts on it.
 *
 * <p>Daylight saving: each range's start and end wall times become instants by
 * {@link ZonedDateTime#ofLocal} with no preferred offset, the JDK's rule: a time in a spring-forward gap moves
 * forward by the gap's length, a time in a fall-back overlap takes the earlier offset. So {@code 01:00-04:00}
 * lasts 2 real hours on the spring day and 4 on the autumn day in Europe/Berlin, and {@code 02:00-03:00} on
 * the spring day there is empty.
 *
 * <p>{@link #on} and {@link #nextChange} allocate (java.time); callers keep the next change and ask again only
 * when it has passed.
 */
public final class ZoneHours {
    /** What one entry of {@code hours} must look like, for messages. */
    public static final String RANGE_EXPECTED = "a day or day range (mon to sun, e.g. \"mon-fri\" or \"sat-mon\") "
            + "and a local time range such as \"06:00-22:00\" (\"22:00-06:00\" crosses midnight, \"00:00-24:00\" "
            + "is the whole day)";
    private static final String[] DAYS = {"mon", "tue", "wed", "thu", "fri", "sat", "sun"};
    private static final int MINUTES_PER_DAY = 24 * 60;
    /** Days looked ahead past the last off date for a change (a week's ranges repeat after 7). */
    private static final int SEARCH_DAYS = 9;

    private final ZoneId timeZone;
    private final List<Range> ranges;
    private final TreeSet<LocalDate> offDates;
    private final String text;

    /**
     * One entry: the days it starts on (bit 0 Monday … bit 6 Sunday) and its local minutes of the day.
     *
     * @param days        bit set of the weekdays the range starts on, Monday = bit 0
     * @param startMinute minutes after local midnight, 0 to 1439
     * @param endMinute   minutes after local midnight, 1 to 1440; not after start: the next day's
     * @param text        the entry as written, lower case
     */
    public record Range(int days, int startMinute, int endMinute, String text) {
        boolean startsOn(DayOfWeek d) {
            return (days & (1 << (d.getValue() - 1))) != 0;
        }

        boolean crossesMidnight() {
            return endMinute <= startMinute;
        }
    }

    /**
     * @param timeZone the site's time zone (a region id such as Europe/Berlin)
     * @param ranges   at least one, from {@link #parseRange}
     * @param offDates local dates that are off hours all day; may be empty
     */
    public ZoneHours(ZoneId timeZone, List<Range> ranges, List<LocalDate> offDates) {
        if (timeZone == null) {
            throw new IllegalArgumentException("timeZone: null (expected the site's time zone)");
        }
        if (ranges.isEmpty()) {
            throw new IllegalArgumentException("hours: [] (expected at least one range)");
        }
        this.timeZone = timeZone;
        this.ranges = List.copyOf(ranges);
        this.offDates = new TreeSet<>(offDates);
        List<String> parts = new ArrayList<>();
        for (Range r : this.ranges) {
            parts.add(r.text());
        }
        this.text = String.join(", ", parts);
    }

    /**
     * Parses one entry of {@code hours}, e.g. {@code "mon-fri 06:00-22:00"}.
     *
     * @throws IllegalArgumentException with {@link #RANGE_EXPECTED} (or a narrower text) as its message
     */
    public static Range parseRange(String s) {
        String t = s.trim().toLowerCase(Locale.ROOT);
        String[] parts = t.split("\\s+");
        if (parts.length != 2) {
            throw new IllegalArgumentException(RANGE_EXPECTED);
        }
        int days = days(parts[0]);
        String[] times = parts[1].split("-", -1);
        if (times.length != 2) {
            throw new IllegalArgumentException(RANGE_EXPECTED);
        }
        int start = minute(times[0]);
        int end = minute(times[1]);
        if (start < 0 || end < 0 || start == MINUTES_PER_DAY) {
            throw new IllegalArgumentException(RANGE_EXPECTED);
        }
        if (end == 0) {
            end = MINUTES_PER_DAY; // "22:00-00:00" is "22:00-24:00"
        }
        if (start == end) {
            throw new IllegalArgumentException("a time range that is not empty (" + parts[1] + " starts where it "
                    + "ends; the whole day is \"00:00-24:00\")");
        }
        return new Range(days, start, end, parts[0] + " " + parts[1]);
    }

    private static int days(String s) {
        String[] ends = s.split("-", -1);
        if (ends.length > 2) {
            throw new IllegalArgumentException(RANGE_EXPECTED);
        }
        int first = day(ends[0]);
        int last = ends.length == 2 ? day(ends[1]) : first;
        if (first < 0 || last < 0) {
            throw new IllegalArgumentException(RANGE_EXPECTED);
        }
        int bits = 0;
        for (int d = first; ; d = (d + 1) % 7) {
            bits |= 1 << d;
            if (d == last) {
                return bits;
            }
        }
    }

    private static int day(String s) {
        for (int i = 0; i < DAYS.length; i++) {
            if (DAYS[i].equals(s)) {
                return i;
            }
        }
        return -1;
    }

    /** Minutes after midnight of "HH:MM" (00:00 to 24:00), or -1. */
    private static int minute(String s) {
        if (!s.matches("[0-9]{2}:[0-9]{2}")) {
            return -1;
        }
        int h = Integer.parseInt(s.substring(0, 2));
        int m = Integer.parseInt(s.substring(3));
        if (m > 59 || h > 24 || (h == 24 && m != 0)) {
            return -1;
        }
        return h * 60 + m;
    }

    public ZoneId timeZone() {
        return timeZone;
    }

    public List<Range> ranges() {
        return ranges;
    }

    /** The off dates, in order. */
    public List<LocalDate> offDates() {
        return List.copyOf(offDates);
    }

    /** True when the zone's rule may raise events at {@code t}. */
    public boolean on(Instant t) {
        LocalDate d = t.atZone(timeZone).toLocalDate();
        if (offDates.contains(d)) {
            return false;
        }
        for (LocalDate day = d.minusDays(1); !day.isAfter(d); day = day.plusDays(1)) {
            if (offDates.contains(day)) {
                continue;
            }
            for (Range r : ranges) {
                if (r.startsOn(day.getDayOfWeek()) && !start(r, day).isAfter(t) && t.isBefore(end(r, day))) {
                    return true;
                }
            }
        }
        return false;
    }

    /** The first instant after {@code t} at which {@link #on} differs from {@code on(t)}; null if never. */
    public Instant nextChange(Instant t) {
        boolean now = on(t);
        LocalDate from = t.atZone(timeZone).toLocalDate().minusDays(1);
        LocalDate last = from.plusDays(1);
        if (!offDates.isEmpty() && offDates.last().isAfter(last)) {
            last = offDates.last();
        }
        last = last.plusDays(SEARCH_DAYS);
        TreeSet<Instant> candidates = new TreeSet<>();
        // days are added in order; every boundary of a later day is at or after that day's start, so the
        // candidates before the start of the next day to add are complete
        for (LocalDate day = from; !day.isAfter(last); day = day.plusDays(1)) {
            Instant dayStart = day.atStartOfDay(timeZone).toInstant();
            for (Instant c; !candidates.isEmpty() && (c = candidates.first()).isBefore(dayStart); ) {
                candidates.pollFirst();
                if (c.isAfter(t) && on(c) != now) {
                    return c;
                }
            }
            candidates.add(dayStart);
            for (Range r : ranges) {
                if (r.startsOn(day.getDayOfWeek())) {
                    candidates.add(start(r, day));
                    candidates.add(end(r, day));
                }
            }
        }
        return null;
    }

    /** Why the zone is off hours at {@code t}, for a {@code zone_off_hours} start: an off date or the hours. */
    public String offReason(Instant t) {
        LocalDate d = t.atZone(timeZone).toLocalDate();
        if (offDates.contains(d)) {
            return "off date " + d;
        }
        LocalDate before = d.minusDays(1);
        if (offDates.contains(before)) {
            // a night range that started on the off date
            for (Range r : ranges) {
                if (r.crossesMidnight() && r.startsOn(before.getDayOfWeek()) && t.isBefore(end(r, before))) {
                    return "off date " + before;
                }
            }
        }
        return "outside hours " + text;
    }

    /**
     * The state at {@code now} and the next change in the site's time with its offset, for {@code check}: e.g.
     * {@code in hours until 2026-12-04T22:00+01:00 (mon-fri 06:00-22:00)}.
     */
    public String describe(Instant now) {
        Instant next = nextChange(now);
        boolean in = on(now);
        String when = next == null ? "from now on" : "until " + next.atZone(timeZone).toOffsetDateTime();
        return (in ? "in hours " : "off hours ") + when + " (" + (in ? text : offReason(now)) + ")";
    }

    /** The ranges as written, e.g. {@code mon-fri 06:00-22:00, sat 07:00-12:00}. */
    @Override
    public String toString() {
        return text;
    }

    private Instant start(Range r, LocalDate day) {
        return at(day, r.startMinute());
    }

    private Instant end(Range r, LocalDate day) {
        return at(r.crossesMidnight() ? day.plusDays(1) : day, r.endMinute());
    }

    /** The instant of a local wall time by the JDK's gap and overlap rule ({@link ZonedDateTime#ofLocal}). */
    private Instant at(LocalDate day, int minute) {
        LocalDateTime local = minute == MINUTES_PER_DAY ? day.plusDays(1).atStartOfDay()
                : day.atTime(LocalTime.of(minute / 60, minute % 60));
        return ZonedDateTime.ofLocal(local, timeZone, null).toInstant();
    }
}
