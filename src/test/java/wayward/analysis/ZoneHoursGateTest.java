package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
import java.time.LocalDateTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.config.ConfigLoader;
import wayward.config.SiteConfig;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/**
 * A zone's hours on a real replay: the yard scene (test-streams/yard-lane.mp4, its truth file: one truck goes the
 * wrong way through lane-2-out from 11.95 s to 15.37 s) with a site clock that runs one minute per stream second
 * (wall = base + 60 × stream seconds, read from the pipeline's stream time, so the hours change at a known frame).
 * Outside the hours the truck's wrong_way start and its end are dropped while the readings go on; an event open
 * when the hours end ends as usual; the schedule's changes are zone_off_hours phases at the first analysed frame
 * at or after each change, valid event records.
 */
class ZoneHoursGateTest {
    private static final ZoneId BERLIN = ZoneId.of("Europe/Berlin");
    private static final double WALL_SECONDS_PER_STREAM_SECOND = 60;

    /** The site's clock: base plus 60 times the stream time of the frame being analysed. */
    private static final class SiteClock extends Clock {
        private final Instant base;
        private volatile CameraPipeline pipeline;

        SiteClock(Instant base) {
            this.base = base;
        }

        @Override
        public Instant instant() {
            return Instant.ofEpochMilli(millis());
        }

        @Override
        public long millis() {
            CameraPipeline p = pipeline;
            double t = p == null ? 0 : p.streamSeconds();
            return base.toEpochMilli() + Math.round(t * WALL_SECONDS_PER_STREAM_SECOND * 1000);
        }

        @Override
        public ZoneId getZone() {
            return ZoneId.of("UTC");
        }

        @Override
        public Clock withZone(ZoneId zone) {
            return this;
        }
    }

    /** What one replay gave: the events, the analysed frames' stream times, zone 0's against shares by time. */
    private record Run(List<Event> events, List<Double> frames, List<double[]> readings, Instant base) {
        List<Event> of(EventKind kind) {
            return events.stream().filter(e -> e.kind() == kind).toList();
        }

        /** The first analysed frame whose wall time is at or after {@code change}. */
        double firstFrameAtOrAfter(Instant change) {
            for (double t : frames) {
                if (base.toEpochMilli() + Math.round(t * WALL_SECONDS_PER_STREAM_SECOND * 1000) >= change.toEpochMilli()) {
                    return t;
                }
            }
            throw new AssertionError("no frame at or after " + change);
        }
    }

    private static Instant berlin(String localDateTime) {
        return LocalDateTime.parse(localDateTime).atZone(BERLIN).toInstant();
    }

    private static Run replay(Path dir, String hours, Instant base) throws Exception {
        Path video = Path.of("test-streams/yard-lane.mp4").toAbsolutePath();
        Path config = dir.resolve("site-" + base.toEpochMilli() + ".toml");
        Files.writeString(config, String.join("\n",
                "[service]",
                "time_zone = \"Europe/Berlin\"",
                "data_dir = \"" + dir.resolve("data").toString().replace("\\", "\\\\") + "\"",
                "[[camera]]",
                "id = \"yard-mast-2\"",
                "source = \"" + video.toString().replace("\\", "\\\\") + "\"",
                "analysis_width = 320",
                "analysis_fps = 10",
                "tamper_alerts = false",
                "  [[camera.zone]]",
                "  id = \"lane-2-out\"",
                "  polygon = [[0.31, 0.98], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]",
                "  heading_deg = 0",
                "  tolerance_deg = 60",
                "  hours = " + hours,
                ""));
        SiteConfig site = ConfigLoader.load(config);
        SiteClock clock = new SiteClock(base);
        List<Event> events = Collections.synchronizedList(new ArrayList<>());
        List<Double> frames = Collections.synchronizedList(new ArrayList<>());
        List<double[]> readings = Collections.synchronizedList(new ArrayList<>());
        CameraPipeline p = new CameraPipeline(site.cameras().get(0), site.flow(), events::add, clock, true, false, 1);
        clock.pipeline = p;
        p.listenFrames((pipeline, f, field, t) -> frames.add(t));
        p.listenReadings((camera, zone, r, movers, state) -> readings.add(new double[] {p.streamSeconds(),
                r.againstShare}));
        p.start();
        assertTrue(p.join(150_000), "the replay ends");
        return new Run(List.copyOf(events), List.copyOf(frames), List.copyOf(readings), base);
    }

    private static double maxAgainst(Run r, double from, double to) {
        double max = 0;
        for (double[] x : r.readings()) {
            if (x[0] >= from && x[0] <= to) {
                max = Math.max(max, x[1]);
            }
        }
        return max;
    }

    private static void assertValidRecords(List<Event> phases) {
        for (Event e : phases) {
            SchemaCheck.assertEventRecord(EventJson.toJson(e));
        }
    }

    @Test
    @Timeout(value = 600, unit = TimeUnit.SECONDS)
    void offHoursDropTheStartAndItsEndWhileReadingsGoOnAndAnOpenEventEndsAsUsual(@TempDir Path dir)
            throws Exception {
        // in hours all the time: the truck's wrong_way event, as the truth file has it (entering at 11.95 s)
        Run always = replay(dir, "[\"mon-sun 00:00-24:00\"]", berlin("2026-12-07T21:50:00"));
        List<Event> wrongWay = always.of(EventKind.WRONG_WAY);
        assertEquals(2, wrongWay.size(), always.events().toString());
        double start = wrongWay.get(0).streamSeconds();
        double end = wrongWay.get(1).streamSeconds();
        assertTrue(start > 11.9 && start < 15.4 && end > start, start + " to " + end);
        assertEquals(List.of(), always.of(EventKind.ZONE_OFF_HOURS), "never off hours");

        // off hours from 22:00 (stream 10 s) to 22:08 (18 s): the start and its end are dropped, readings go on
        Run off = replay(dir, "[\"mon-sun 06:00-22:00\", \"mon-sun 22:08-23:59\"]", berlin("2026-12-07T21:50:00"));
        assertEquals(List.of(), off.of(EventKind.WRONG_WAY), "nothing raised off hours: " + off.events());
        assertTrue(maxAgainst(off, start, end) > 0.01, "the zone still measures the truck against its heading");
        assertEquals(maxAgainst(always, 0, 30), maxAgainst(off, 0, 30), 1e-12, "the same readings as in hours");
        List<Event> hours = off.of(EventKind.ZONE_OFF_HOURS);
        assertEquals(2, hours.size(), hours.toString());
        Event offStart = hours.get(0);
        Event offEnd = hours.get(1);
        assertEquals(Event.Phase.START, offStart.phase());
        assertEquals(Event.Phase.END, offEnd.phase());
        assertEquals(offStart.id(), offEnd.id());
        assertEquals("lane-2-out", offStart.zone());
        assertEquals(off.firstFrameAtOrAfter(berlin("2026-12-07T22:00:00")), offStart.streamSeconds(), 1e-9);
        assertEquals(off.firstFrameAtOrAfter(berlin("2026-12-07T22:08:00")), offEnd.streamSeconds(), 1e-9);
        assertEquals(berlin("2026-12-07T22:08:00"), offStart.control().until(), "when the hours begin again");
        assertEquals(berlin("2026-12-07T23:59:00"), offEnd.control().until(), "when they end next");
        assertNull(offStart.control().by(), "the schedule, not a person");
        assertEquals("outside hours mon-sun 06:00-22:00, mon-sun 22:08-23:59", offStart.control().reason());
        assertEquals(offEnd.streamSeconds() - offStart.streamSeconds(), offEnd.durationSeconds(), 1e-9);
        assertValidRecords(hours);

        // hours end while the truck's event is open (halfway through it): it starts and ends as usual
        double middle = (start + end) / 2;
        Instant base = berlin("2026-12-07T22:00:00").minusMillis(Math.round(middle * WALL_SECONDS_PER_STREAM_SECOND * 1000));
        Run open = replay(dir, "[\"mon-sun 06:00-22:00\"]", base);
        List<Event> openWrongWay = open.of(EventKind.WRONG_WAY);
        assertEquals(2, openWrongWay.size(), open.events().toString());
        assertEquals(start, openWrongWay.get(0).streamSeconds(), 1e-9);
        assertEquals(end, openWrongWay.get(1).streamSeconds(), 1e-9);
        List<Event> openHours = open.of(EventKind.ZONE_OFF_HOURS);
        assertEquals(1, openHours.size(), "off from the middle of the event to the end of the stream: " + openHours);
        assertEquals(open.firstFrameAtOrAfter(berlin("2026-12-07T22:00:00")), openHours.get(0).streamSeconds(), 1e-9);
        assertEquals(berlin("2026-12-08T06:00:00"), openHours.get(0).control().until());
        assertValidRecords(openHours);
    }

    @Test
    @Timeout(value = 300, unit = TimeUnit.SECONDS)
    void aZoneThatStartsOutsideItsHoursSaysSoAtTheFirstFrame(@TempDir Path dir) throws Exception {
        LocalDateTime christmas = LocalDateTime.parse("2026-12-25T10:00:00");
        Run r = replay(dir, "[\"mon-fri 06:00-22:00\"]\n  off_dates = [2026-12-24, 2026-12-25]",
                christmas.atZone(BERLIN).toInstant());
        assertEquals(List.of(), r.of(EventKind.WRONG_WAY), r.events().toString());
        List<Event> hours = r.of(EventKind.ZONE_OFF_HOURS);
        assertEquals(1, hours.size(), hours.toString());
        // the stream's first frame (0 s), which has no flow yet and so comes before the frames with flow listed
        assertEquals(0, hours.get(0).streamSeconds(), 1e-9, "the first analysed frame");
        assertTrue(r.frames().get(0) > 0);
        assertEquals("off date 2026-12-25", hours.get(0).control().reason());
        // the 25th is a friday: the next hours are monday's
        assertEquals(berlin("2026-12-28T06:00:00"), hours.get(0).control().until());
        assertValidRecords(hours);
    }
}
