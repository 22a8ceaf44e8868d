package wayward.rule;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;
import wayward.zone.ZoneReading;

class ZoneRuleTest {
    private static final Clock CLOCK = Clock.fixed(Instant.parse("2026-12-02T10:00:00Z"), ZoneOffset.UTC);
    private static final RuleSettings SETTINGS = new RuleSettings(0.05, 0.02, 0.5, 1.0, 2.0);

    /** Feeds a level at 10 readings per second from t0 to t1 (exclusive) and collects the events. */
    private static void feed(ZoneRule rule, double level, double t0, double t1, List<Event> out) {
        ZoneReading r = new ZoneReading();
        for (int k = 0; t0 + k * 0.1 < t1 - 1e-9; k++) {
            r.streamSeconds = Math.round((t0 + k * 0.1) * 1000) / 1000.0;
            r.againstShare = level;
            r.againstBearingDeg = 180;
            r.againstSpeedPxPerSecond = 40;
            Event e = rule.update(r);
            if (e != null) {
                out.add(e);
            }
        }
    }

    @Test
    void startsAfterHoldAndEndsAfterClear() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, SETTINGS, CLOCK);
        List<Event> events = new ArrayList<>();
        feed(rule, 0.0, 0, 1, events);
        feed(rule, 0.10, 1, 3, events);
        feed(rule, 0.0, 3, 6, events);
        assertEquals(2, events.size());
        Event start = events.get(0);
        Event end = events.get(1);
        assertEquals(Event.Phase.START, start.phase());
        assertEquals(EventKind.WRONG_WAY, start.kind());
        assertEquals(1.5, start.streamSeconds(), 1e-9, "onset at 1.0 s + hold 0.5 s");
        assertEquals(180, start.bearingDeg(), 1e-9);
        assertEquals(0.10, start.share(), 1e-9);
        assertEquals(Event.Phase.END, end.phase());
        assertEquals(start.id(), end.id());
        assertEquals(3.9, end.streamSeconds(), 1e-9, "last present 2.9 s + clear 1.0 s");
        assertEquals(2.4, end.durationSeconds(), 1e-9);
        assertEquals(Instant.parse("2026-12-02T10:00:00Z"), start.at());
    }

    @Test
    void shortBlipBelowHoldTimeDoesNotFire() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, SETTINGS, CLOCK);
        List<Event> events = new ArrayList<>();
        feed(rule, 0.10, 0, 0.4, events);
        feed(rule, 0.0, 0.4, 2, events);
        assertEquals(0, events.size());
    }

    @Test
    void dipBetweenReleaseAndOnsetKeepsTheEventOpen() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, SETTINGS, CLOCK);
        List<Event> events = new ArrayList<>();
        feed(rule, 0.10, 0, 1, events);
        feed(rule, 0.03, 1, 4, events); // above release 0.02: still present
        assertEquals(1, events.size());
        feed(rule, 0.0, 4, 6, events);
        assertEquals(2, events.size());
        assertEquals(4.9, events.get(1).streamSeconds(), 1e-9);
    }

    @Test
    void restTimeBlocksAnImmediateRestart() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, SETTINGS, CLOCK);
        List<Event> events = new ArrayList<>();
        feed(rule, 0.10, 0, 1, events);
        feed(rule, 0.0, 1, 2.0, events); // ends at 0.9 + 1.0 = 1.9; rest until 3.9
        assertEquals(2, events.size());
        feed(rule, 0.10, 2.0, 3.8, events); // within the rest time
        assertEquals(2, events.size());
        feed(rule, 0.10, 3.8, 5, events); // rest over at 3.9: onset there, start after hold at 4.4
        assertEquals(3, events.size());
        assertEquals(4.4, events.get(2).streamSeconds(), 1e-9);
    }

    @Test
    void zoneWithoutHeadingReportsMotionFromCoverage() {
        ZoneRule rule = new ZoneRule("cam", "door", false, SETTINGS, CLOCK);
        ZoneReading r = new ZoneReading();
        r.movingShare = 0.2;
        r.movingBearingDeg = 90;
        r.movingSpeedPxPerSecond = 10;
        Event e = null;
        for (int k = 0; k <= 5 && e == null; k++) {
            r.streamSeconds = k * 0.1;
            e = rule.update(r);
        }
        assertNotNull(e);
        assertEquals(EventKind.MOTION, e.kind());
        assertEquals(90, e.bearingDeg(), 1e-9);
        SchemaCheck.assertEventRecord(wayward.event.EventJson.toJson(e));
    }

    @Test
    void finishClosesAnOpenEventAtTheEndOfTheStream() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, SETTINGS, CLOCK);
        List<Event> events = new ArrayList<>();
        feed(rule, 0.10, 0, 1, events);
        Event end = rule.finish(0.9);
        assertNotNull(end);
        assertEquals(Event.Phase.END, end.phase());
        assertNull(rule.finish(1.0));
    }

    /** Readings at 10 per second with a given against speed (px/s). */
    private static void feedSpeed(ZoneRule rule, double level, double speed, double t0, double t1, List<Event> out) {
        ZoneReading r = new ZoneReading();
        for (int k = 0; t0 + k * 0.1 < t1 - 1e-9; k++) {
            r.streamSeconds = Math.round((t0 + k * 0.1) * 1000) / 1000.0;
            r.againstShare = level;
            r.againstBearingDeg = 180;
            r.againstSpeedPxPerSecond = speed;
            Event e = rule.update(r);
            if (e != null) {
                out.add(e);
            }
        }
    }

    // travel = ∫ speed dt, worked out by hand for the 0.1 s steps below
    private static final RuleSettings TRAVEL = new RuleSettings(0.05, 0.02, 0.5, 1.0, 2.0, 10, 30);

    @Test
    void swayingBackAndForthNeverCarriesFarEnough() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, TRAVEL, CLOCK);
        List<Event> events = new ArrayList<>();
        // against for 0.8 s at 10 px/s (8 px), then with the heading for 0.8 s, again and again
        for (int cycle = 0; cycle < 10; cycle++) {
            feedSpeed(rule, 0.10, 10, cycle * 1.6, cycle * 1.6 + 0.8, events);
            feedSpeed(rule, 0.0, 0, cycle * 1.6 + 0.8, cycle * 1.6 + 1.6, events);
        }
        assertEquals(List.of(), events, "held 0.8 s each time, but only 7–8 px carried");
    }

    @Test
    void aSlowMoverStartsOnceItHasCarriedTheMinimumTravel() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, TRAVEL, CLOCK);
        List<Event> events = new ArrayList<>();
        feedSpeed(rule, 0.10, 12, 1.0, 4.0, events);
        // pending from 1.0 s; 12 px/s carries 1.2 px per step: 10 px after 9 steps, at 1.9 s (hold alone: 1.5 s)
        assertEquals(1.9, events.get(0).streamSeconds(), 1e-9);
    }

    @Test
    void aFastMoverStartsBeforeTheHoldTime() {
        ZoneRule rule = new ZoneRule("cam", "lane", true, TRAVEL, CLOCK);
        List<Event> events = new ArrayList<>();
        feedSpeed(rule, 0.10, 150, 1.0, 1.4, events);
        feedSpeed(rule, 0.0, 0, 1.4, 4.0, events);
        // 15 px per step: 30 px after 2 steps, at 1.2 s, while the hold would need until 1.5 s
        assertEquals(1.2, events.get(0).streamSeconds(), 1e-9);
        assertEquals(Event.Phase.START, events.get(0).phase());
    }
}
