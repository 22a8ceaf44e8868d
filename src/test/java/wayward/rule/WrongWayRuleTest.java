package wayward.rule;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.flow.FlowField;
import wayward.testing.SchemaCheck;
import wayward.zone.MoverSettings;
import wayward.zone.MoverTracker;
import wayward.zone.Movers;
import wayward.zone.ZoneMask;

/** The mover rule on hand-made tracks, and end to end with the tracker on synthetic flow (analytic truth). */
class WrongWayRuleTest {
    private static final Clock CLOCK = Clock.fixed(Instant.parse("2026-12-01T08:00:00Z"), ZoneOffset.UTC);
    // explicit rather than the defaults, so the scripted travels below keep their meaning when a default moves:
    // hold 0.5 s, clear 1 s, rest 2 s, min travel 10 px, quick travel 30 px, min area 48 px²
    private static final MoverRuleSettings SETTINGS = new MoverRuleSettings(0.5, 1, 2, 10, 30, 48);
    private static final double DT = 0.1;

    /** One frame with the given tracks: {id, bornAt, travel, samples, y} each; x fixed at 160, speed 30 px/s. */
    private static Event frame(WrongWayRule rule, Movers m, double t, double[]... tracks) {
        m.begin(t, 320, 180, 4);
        for (double[] k : tracks) {
            m.put((long) k[0], true, t - k[1], k[2], (int) k[3], (int) k[3], 12, 20, 160, k[4], 0, 30, 30);
        }
        m.end();
        return rule.update(m, 0.01);
    }

    /** Keeps a phase the rule decided, held to the shipped event schema on the way. */
    private static void collect(List<Event> out, Event e) {
        if (e != null) {
            SchemaCheck.assertEventRecord(wayward.event.EventJson.toJson(e));
            out.add(e);
        }
    }

    /**
     * Frames n = 0 … last of track id, born at t, 3 px a frame down the picture from y 40 (15 samples, all seen);
     * returns the stream time after them.
     */
    private static double drive(WrongWayRule rule, Movers m, List<Event> out, double t, long id, int last) {
        final double born = t;
        for (int n = 0; n <= last; n++, t += DT) {
            collect(out, frame(rule, m, t, new double[] {id, born, 3 * n, 15, 40 + 3 * n}));
        }
        return t;
    }

    /** That many frames without any mover; returns the stream time after them. */
    private static double nothing(WrongWayRule rule, Movers m, List<Event> out, double t, int frames) {
        for (int n = 0; n < frames; n++, t += DT) {
            collect(out, frame(rule, m, t));
        }
        return t;
    }

    @Test
    void oneMoverThatHeldAndTravelledStartsAndEndsOneEvent() {
        WrongWayRule rule = new WrongWayRule("yard-mast-2", "lane-2-out", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 20; n++) {
            double t = n * DT;
            collect(out, frame(rule, m, t, new double[] {1, 0, 3 * n, 15, 40 + 3 * n}));
        }
        for (int n = 21; n <= 40; n++) {
            collect(out, frame(rule, m, n * DT));
        }
        assertEquals(2, out.size());
        Event start = out.get(0);
        // hold 0.5 s and 10 px: at 3 px a frame the travel reaches 10 px at frame 4, the hold at frame 5
        assertEquals(0.5, start.streamSeconds(), 1e-9);
        assertEquals(Event.Phase.START, start.phase());
        assertEquals(15, start.mover().samples());
        assertEquals(12, start.mover().widthPx());
        assertEquals(20, start.mover().heightPx());
        assertEquals(15, start.mover().travelPx(), 1e-9);
        assertEquals(180, start.bearingDeg(), 1e-9); // moving down the picture
        double[] path = start.mover().path();
        assertEquals(0.5, path[0], 1e-9); // x 160 of 320
        assertEquals(40.0 / 180, path[1], 1e-6); // where it was first seen
        assertEquals(55.0 / 180, path[path.length - 1], 1e-6); // where it is at the start
        Event end = out.get(1);
        assertEquals(Event.Phase.END, end.phase());
        assertEquals(start.id(), end.id());
        // last seen at 2.0 s, clear 1 s
        assertEquals(3.0, end.streamSeconds(), 1e-9);
        assertEquals(60, end.mover().travelPx(), 1e-9);
    }

    @Test
    void aWallClockSteppedBackDuringAnEventChangesOnlyItsAt() {
        // NTP steps the wall clock an hour back after the start: hold, clear and duration run on stream time
        wayward.testing.SteppingClock stepping = new wayward.testing.SteppingClock(
                Instant.parse("2026-12-01T08:00:00Z"));
        WrongWayRule rule = new WrongWayRule("yard-mast-2", "lane-2-out", SETTINGS, stepping);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 20; n++) {
            if (n == 8) {
                stepping.step(-3600);
            }
            collect(out, frame(rule, m, n * DT, new double[] {1, 0, 3 * n, 15, 40 + 3 * n}));
        }
        for (int n = 21; n <= 40; n++) {
            collect(out, frame(rule, m, n * DT));
        }
        assertEquals(2, out.size());
        assertEquals(0.5, out.get(0).streamSeconds(), 1e-9, "the same start as with a steady clock");
        assertEquals(3.0, out.get(1).streamSeconds(), 1e-9, "the same end");
        assertEquals(2.5, out.get(1).durationSeconds(), 1e-9, "duration on stream time, not negative");
        assertEquals(Instant.parse("2026-12-01T07:00:00Z"), out.get(1).at(), "only the wall time of the end moved");
    }

    @Test
    void quickTravelStartsBeforeTheHold() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        Event e = null;
        int n = 0;
        while (e == null && n < 10) {
            e = frame(rule, m, n * DT, new double[] {1, 0, 12 * n, 10, 40 + 12 * n});
            n++;
        }
        // 12 px a frame: 30 px (quick_travel_px) at frame 3 = 0.3 s, before the 0.5 s hold
        assertEquals(0.3, e.streamSeconds(), 1e-9);
    }

    @Test
    void twoWrongWayMoversInARowAreTwoEvents() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        double t = drive(rule, m, out, 0, 1, 20);
        t = nothing(rule, m, out, t, 15);
        double born = t;
        t = drive(rule, m, out, t, 2, 20);
        nothing(rule, m, out, t, 15);
        assertEquals(4, out.size(), out.toString());
        assertEquals(Event.Phase.START, out.get(2).phase());
        assertNotEquals(out.get(0).id(), out.get(2).id());
        assertEquals(born + 0.5, out.get(2).streamSeconds(), 1e-6);
    }

    @Test
    void aSecondMoverWhileTheFirstIsOpenGetsItsOwnEvent() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 30; n++) {
            double t = n * DT;
            // the second one enters 1 s later, 90 px behind: not part of the first
            collect(out, n < 10 ? frame(rule, m, t, new double[] {1, 0, 3 * n, 15, 100 + 3 * n})
                    : frame(rule, m, t, new double[] {1, 0, 3 * n, 15, 100 + 3 * n},
                            new double[] {2, 1.0, 3 * (n - 10), 15, 10 + 3 * (n - 10)}));
        }
        List<Event> starts = out.stream().filter(e -> e.phase() == Event.Phase.START).toList();
        assertEquals(2, starts.size(), out.toString());
        // the first ends when the second qualifies (1.5 s), the second starts with the next frame
        assertEquals(Event.Phase.END, out.get(1).phase());
        assertEquals(1.5, out.get(1).streamSeconds(), 1e-9);
        assertEquals(1.6, starts.get(1).streamSeconds(), 1e-9);
    }

    /** Two bodies (or two parts of one) driving down the picture one behind the other at 30 px/s; event starts. */
    private static List<Event> twoBehind(double gapPx, int w, int h, int samples2, double vx2) {
        return twoBehind(gapPx, w, h, samples2, vx2, Double.POSITIVE_INFINITY);
    }

    /** As above, the tracker having found still ground {@code stillAhead} px ahead of the one behind. */
    private static List<Event> twoBehind(double gapPx, int w, int h, int samples2, double vx2, double stillAhead) {
        return behind(gapPx, w, h, w, h, samples2, vx2, stillAhead);
    }

    /**
     * A body w1 × h1 of 60 samples driving down the picture at 30 px/s and, gapPx behind it box to box, one of
     * w2 × h2 with samples2 (its velocity read vx2 px/s sideways), the tracker having found still ground
     * stillAhead px ahead of the one behind; the event starts.
     */
    private static List<Event> behind(double gapPx, int w1, int h1, int w2, int h2, int samples2, double vx2,
            double stillAhead) {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 30; n++) {
            double t = n * DT;
            double y1 = 100 + 3 * n;
            double y2 = y1 - (h1 + h2) / 2.0 - gapPx; // box to box: gapPx of still ground between them
            m.begin(t, 320, 180, 4);
            m.put(1, true, t, 3 * n, 60, 60, w1, h1, 160, y1, 0, 30, 30);
            int second = m.put(2, true, t, 3 * n, samples2, samples2, w2, h2, 160, y2, vx2, 30, Math.hypot(vx2, 30));
            m.stillAheadPx(second, stillAhead);
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        return out.stream().filter(e -> e.phase() == Event.Phase.START).toList();
    }

    @Test
    void twoWholeBodiesNoseToTailAreTwoEvents() {
        // 36 × 36 px bodies 24 px apart (1.2 s behind at 48 px/s, as in the suite's two-in-a-row scenes)
        assertEquals(2, twoBehind(24, 36, 36, 60, 0).size());
        // touching boxes (within three grid points) are one body read as two tracks
        assertEquals(1, twoBehind(8, 36, 36, 60, 0).size());
    }

    // analytic script (probe p07's pattern): body 1 starts an event; body 2, 100 px behind it with still ground
    // between, is a different mover and ends it (body 1 retires); then a new track is born inside body 1's box,
    // as the tracker does when it reads a body's front edge apart, and travels far enough. It is a piece of a
    // retired body, not a third passage: two events, not three
    @Test
    void aTrackBornOnARetiredBodyIsRetiredWithIt() {
        // born 15 px below body 1's centroid: inside its 40 px tall box
        List<Event> starts = pieceBelow(15);
        assertEquals(2, starts.size(), starts.toString());
        // the same piece born outside the body's box (25 px below its bottom edge) is a mover of its own
        assertEquals(3, pieceBelow(45).size());
    }

    /**
     * Body 1 (32 × 40, 60 samples) from y 110 and body 2 100 px behind it from 0.5 s, both 3 px a frame down the
     * picture with still ground between them; from 1.4 s a 12 × 8 piece of 15 samples {@code below} px under
     * body 1's centroid, going with it. The starts.
     */
    private static List<Event> pieceBelow(double below) {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 40; n++) {
            double t = n * DT;
            double y1 = 110 + 3 * n;
            m.begin(t, 320, 320, 4);
            m.put(1, true, t, 3 * n, 60, 60, 32, 40, 160, y1, 0, 30, 30);
            if (n >= 5) {
                int k = m.put(2, true, t - 0.5, 3 * (n - 5), 40, 40, 32, 40, 160, y1 - 100, 0, 30, 30);
                m.stillAheadPx(k, 40);
            }
            if (n >= 14) {
                m.put(3, true, t - 1.4, 3 * (n - 14), 15, 15, 12, 8, 160, y1 + below, 0, 30, 30);
            }
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        return out.stream().filter(e -> e.phase() == Event.Phase.START).toList();
    }

    /** A body of 60 samples and, {@code gapPx} behind it (box to box), a rim {@code rimW} × 6 px of 10. */
    private static List<Event> rimBehindBody(double gapPx, int bodyW, int bodyH, int rimW) {
        return behind(gapPx, bodyW, bodyH, rimW, 6, 10, 0, Double.POSITIVE_INFINITY);
    }

    @Test
    void theFrontRimOfAPlainBodyFollowingAWholeOneIsTheNextPassage() {
        // geometry alone: a 24 × 6 rim 20 px behind a 36 × 36 body along +y; ahead of it, or beside it, it is not
        assertTrue(WrongWayRule.followsWholeBody(0, -41, 24, 6, 0, 30, 36, 36, 0, 1));
        assertTrue(!WrongWayRule.followsWholeBody(0, 41, 24, 6, 0, 30, 36, 36, 0, 1), "ahead: a beam or a bumper");
        assertTrue(!WrongWayRule.followsWholeBody(0, -25, 24, 6, 0, 30, 36, 36, 0, 1), "4 px behind: its own back");
        assertTrue(!WrongWayRule.followsWholeBody(0, -41, 24, 6, 0, 30, 36, 8, 0, 1), "behind a rim: one plain body");
        // a rim of 10 samples is a sixth of the body's 60, small enough to pass for a fragment of it; 20 px of
        // ground between them (more than three grid points) make it the front of the next body
        assertEquals(2, rimBehindBody(20, 36, 36, 24).size());
        // touching the body's back (within three grid points) it is the body's own back edge
        assertEquals(1, rimBehindBody(8, 36, 36, 24).size());
        // behind the front rim of a plain body (36 × 8): the two rims of one body, as before
        assertEquals(1, rimBehindBody(20, 36, 8, 24).size());
    }

    @Test
    void quickTravelNeedsASecondSighting() {
        // a light switched on reads as one frame of large motion on a track that is never seen again
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        assertNull(frame(rule, m, 1.0, new double[] {1, 1.0, 40, 10, 60}));
        assertNull(frame(rule, m, 1.1));
        // a fast mover is seen again one frame later, and starts then
        assertNull(frame(rule, m, 2.0, new double[] {2, 2.0, 31, 10, 60}));
        Event e = frame(rule, m, 2.1, new double[] {2, 2.0, 39, 10, 63});
        assertEquals(Event.Phase.START, e.phase());
    }

    @Test
    void twoPartsOfOneBodyReadAtDifferentSpeedsAreOneEvent() {
        // a photo-textured chassis read as a front and a back track 4 px apart: the back one's flow reads 25 px/s
        // sideways besides the 30 px/s both go (39.8° off, 9 px/s faster), or 82 px/s (70° off, as a flickering
        // lamp pulled one reading in tune s66); parts of one body read their velocity poorly
        assertEquals(1, twoBehind(4, 36, 36, 60, 25).size());
        assertEquals(1, twoBehind(4, 36, 36, 60, 82).size());
        // what makes them two is the ground between them: still texture, or a gap nose to tail
        assertEquals(2, twoBehind(4, 36, 36, 60, 25, 2).size());
        assertEquals(2, twoBehind(24, 36, 36, 60, 25).size());
    }

    @Test
    void twoHeadlightsSideBySideAreOneEvent() {
        // at night a vehicle shows as two lights 24 px apart across its motion, each followed as a whole body:
        // side by side is not nose to tail
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        for (int n = 0; n <= 30; n++) {
            double t = n * DT;
            m.begin(t, 320, 180, 4);
            m.put(1, true, t, 3 * n, 8, 8, 8, 8, 148, 40 + 3 * n, 0, 30, 30);
            // the second light is picked up a little later (its travel lags), so it qualifies while the first is open
            m.put(2, true, Math.max(0, t - 0.3), Math.max(0, 3 * n - 9), 8, 8, 8, 8, 172, 40 + 3 * n, 0, 30, 30);
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        assertEquals(1, out.stream().filter(e -> e.phase() == Event.Phase.START).count(), out.toString());
        assertTrue(WrongWayRule.noseToTail(0, 60, 36, 36, 36, 36, 0, 1), "one 60 px behind the other, in line");
        assertTrue(!WrongWayRule.noseToTail(24, 0, 8, 8, 8, 8, 0, 1), "side by side across the motion");
        assertTrue(!WrongWayRule.noseToTail(0, 40, 36, 36, 36, 36, 0, 1), "boxes 4 px apart: touching");
    }

    @Test
    void theFrontAndTheBackRimOfOnePlainBodyAreOneEvent() {
        // 40 × 8 px rims 32 px apart: thin along their motion, the inside between them carries no trusted sample
        assertEquals(1, twoBehind(32, 40, 8, 60, 0).size());
    }

    @Test
    void stillGroundBetweenTwoRimsMakesThemTwoMovers() {
        // the rims of the last test, but the tracker saw still textured ground 10 px ahead of the one behind,
        // 28 px short of the one ahead (centroids 40 px apart, half a rim's length 4 px): two bodies
        assertEquals(2, twoBehind(32, 40, 8, 60, 0, 10).size());
        // still ground only beyond the one ahead (ahead of both): one body
        assertEquals(1, twoBehind(32, 40, 8, 60, 0, 60).size());
    }

    @Test
    void aFewSamplesAtAMoversSideWithAnotherVelocityAreAFragmentOfIt() {
        // a glare patch of 4 samples (a fifteenth of the body's 60) 20 px away, its velocity read 25 px/s sideways
        // (39.8° off: within 60°)
        assertEquals(1, twoBehind(20, 36, 36, 4, 25).size());
        // the same patch 60 px away (centroids 96 px apart, beyond twice the body's size) is a mover of its own
        assertEquals(2, twoBehind(60, 36, 36, 4, 25).size());
    }

    @Test
    void theSameMoverPickedUpAgainWithinRestDoesNotAlertTwice() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        double t = drive(rule, m, out, 0, 1, 10);
        // lost for 1.1 s (past clear: the event ends), then found again as a new track where it went on
        t = nothing(rule, m, out, t, 11);
        double born = t;
        for (int n = 0; n <= 8; n++, t += DT) {
            collect(out, frame(rule, m, t, new double[] {3, born, 3 * n, 15, 40 + 30 + 33 + 3 * n}));
        }
        assertEquals(2, out.size(), out.toString());
    }

    @Test
    void aCrawlerPickedUpAgainWithinRestDoesNotAlertTwiceWhenItQualifiesLater() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        double t = 0;
        // a crawl at 1 px a frame (10 px/s): 10 px after 1 s
        for (int n = 0; n <= 15; n++, t += DT) {
            collect(out, frame(rule, m, t, new double[] {1, 0, n, 15, 40 + n}));
        }
        // lost for 1.1 s: the event ends at the last sighting + clear
        t = nothing(rule, m, out, t, 11);
        // found again where it crawled on, 0.1 s into rest; at 1 px a frame it travels 10 px only after rest
        double born = t;
        for (int n = 0; n <= 30; n++, t += DT) {
            collect(out, frame(rule, m, t, new double[] {4, born, n, 15, 40 + 15 + 11 + n}));
        }
        assertEquals(2, out.size(), "one start and one end: " + out);
    }

    /**
     * A member lost at 1.0 s and a new track born 0.3 s later where its speed puts it, at its pace, whose own travel
     * stays under the minimum (the flow reads a plain body's outline short); (vx, vy) is the new track's velocity.
     * Returns the phases.
     */
    private static List<Event> pickedUp(double vx, double vy, int samples) {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        double t = drive(rule, m, out, 0, 1, 10);
        t = nothing(rule, m, out, t, 2);
        double born = t;
        for (int n = 0; n <= 20; n++, t += DT) {
            m.begin(t, 320, 180, 4);
            // where the member's 30 px/s puts it: 70 px at 1.0 s, 9 px further 0.3 s later
            m.put(2, true, t - born, 0.2 * n, samples, samples, 12, 20, 160, 79 + 3 * n, vx, vy, Math.hypot(vx, vy));
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        nothing(rule, m, out, t, 15);
        return out;
    }

    @Test
    void aMoverPickedUpAgainByANewTrackStaysTheEventsBeforeTheTrackQualifies() {
        // analytic: lost at 1.0 s, picked up from 1.3 s to 3.3 s; the event ends at 3.3 + clear 1 s, not at 2.0 s
        List<Event> out = pickedUp(0, 30, 15);
        assertEquals(2, out.size(), out.toString());
        assertEquals(4.3, out.get(1).streamSeconds(), 1e-6);
        // a track there that goes across, at a third of the pace, or is a speck of it is not the member: 1.0 + 1 s
        assertEquals(2.0, pickedUp(30, 0, 15).get(1).streamSeconds(), 1e-6);
        assertEquals(2.0, pickedUp(0, 10, 15).get(1).streamSeconds(), 1e-6);
        assertEquals(2.0, pickedUp(0, 30, 3).get(1).streamSeconds(), 1e-6);
    }

    @Test
    void aMoverWhoseBodyAnotherTrackWonStaysTheEventsWhileItsOwnTrackWandersOffToASpeck() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        List<Event> out = new ArrayList<>();
        double t = 0;
        // member 1: 15 samples, 30 px/s down, 70 px at 1.0 s; track 2 began at 0.8 s as a speck beside it
        for (int n = 0; n <= 10; n++, t += DT) {
            m.begin(t, 320, 180, 4);
            m.put(1, true, t, 3 * n, 15, 15, 12, 20, 160, 40 + 3 * n, 0, 30, 30);
            if (t > 0.75) {
                m.put(2, true, t - 0.8, 0, 3, 3, 4, 8, 150, 40 + 3 * n, 0, 30, 30);
            }
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        // at 1.1 s track 2 wins the body (15 samples where the member goes on) and track 1 pairs with a speck
        // 37 px on; then track 1 is gone and track 2 goes on, its own travel under the minimum, until 3.0 s
        double born = 0.8;
        for (int n = 11; n <= 30; n++, t += DT) {
            m.begin(t, 320, 180, 4);
            if (n == 11) {
                m.put(1, true, t, 33, 2, 15, 4, 8, 160, 110, 0, 30, 30);
            }
            m.put(2, true, t - born, 0.2 * n, 15, 15, 12, 20, 160, 40 + 3 * n, 0, 30, 30);
            m.end();
            collect(out, rule.update(m, 0.01));
        }
        nothing(rule, m, out, t, 15);
        // analytic: one event; it ends at track 2's last sighting (3.0 s) + clear (1 s), not at 1.1 + 1 s
        assertEquals(2, out.size(), out.toString());
        assertEquals(4.0, out.get(1).streamSeconds(), 1e-6);
    }

    @Test
    void aSwayingThingNeverTravelsFarEnough() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        for (int n = 0; n <= 100; n++) {
            // ±4 px back and forth (a bush at the zone's edge): travel against swings between 0 and 8 px
            double travel = 4 + 4 * Math.sin(n * 0.6);
            assertEquals(null, frame(rule, m, n * DT, new double[] {1, 0, travel, 20, 40}));
        }
    }

    /**
     * A crawler at 4 px/s (0.4 px a frame) scripted frame by frame: seen in frames where {@code seenEvery}
     * divides n, with {@code samples(n)} moving samples, its travel {@code travel(n)}; returns the start's time.
     */
    private static double crawlStart(int seenEvery, java.util.function.IntUnaryOperator samples,
            java.util.function.IntToDoubleFunction travel) {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        for (int n = 0; n <= 60; n++) {
            double t = n * DT;
            boolean seen = n % seenEvery == 0;
            m.begin(t, 320, 180, 4);
            m.put(1, seen, t, travel.applyAsDouble(n), seen ? samples.applyAsInt(n) : 0, 40, 12, 12, 160,
                    40 + travel.applyAsDouble(n), 0, 4, 4);
            m.end();
            Event e = rule.update(m, 0.01);
            if (e != null) {
                return e.streamSeconds();
            }
        }
        return Double.NaN;
    }

    @Test
    void aSteadyCrawlerQualifiesWithLessTravelAfterTwoHolds() {
        // analytic: travel 0.4 px a frame; 0.4 of min travel 10 px is 4 px (frame 10), two holds 1.0 s (frame 10);
        // the full 10 px with the hold come at frame 25
        assertEquals(1.0, crawlStart(1, n -> 20, n -> 0.4 * n), 1e-9);
        // samples alternating 5 and 35 vary by 15 / 20 = 0.75 of their mean: not one steady body
        assertEquals(2.5, crawlStart(1, n -> n % 2 == 0 ? 5 : 35, n -> 0.4 * n), 1e-9);
        // seen in every other frame only (half its frames): not steady; frame 25 is unseen, so frame 26 starts
        assertEquals(2.6, crawlStart(2, n -> 20, n -> 0.4 * n), 1e-9);
        // went back 2 grid steps (8 px) from frame 8 on and came on again: swinging, not crawling; 10 px at frame
        // 37 (steady, 4 px would start frame 29)
        assertEquals(3.7, crawlStart(1, n -> 20, n -> n <= 8 ? 0.4 * n : n <= 18 ? 3.2 - 0.8 * (n - 8)
                : -4.8 + 0.8 * (n - 18)), 1e-9);
    }

    @Test
    void aMoverSmallerThanTheMinimumDoesNotCount() {
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        Movers m = new Movers(8);
        for (int n = 0; n <= 20; n++) {
            // 2 samples × 16 px² = 32 px², under min_mover_area_px 48
            assertEquals(null, frame(rule, m, n * DT, new double[] {1, 0, 3 * n, 2, 40 + 3 * n}));
        }
    }

    /** The tracker and the rule on one mover, in a zone drawn as given; returns the start's stream time or NaN. */
    private static double startIn(double[] xs, double[] ys) {
        FlowField f = new FlowField(320, 180, 4);
        MoverTracker tracker = new MoverTracker(ZoneMask.rasterise(xs, ys, f), f, 0, MoverSettings.of(8, 8, 60), true);
        Movers m = tracker.newMovers();
        WrongWayRule rule = new WrongWayRule("c", "z", SETTINGS, CLOCK);
        for (int n = 1; n <= 30; n++) {
            java.util.Arrays.fill(f.u, 0);
            java.util.Arrays.fill(f.v, 0);
            java.util.Arrays.fill(f.confidence, 100);
            // a 3×5-sample mover, 2 px down per frame (20 px/s), from y = 60 px
            int j0 = (int) Math.round((60 + 2.0 * n - 2) / 4);
            for (int j = j0; j < j0 + 5; j++) {
                for (int i = 39; i < 42; i++) {
                    f.v[j * f.width + i] = 2;
                }
            }
            tracker.update(f, DT, n * DT, m);
            Event e = rule.update(m, 0);
            if (e != null && e.phase() == Event.Phase.START) {
                return n * DT;
            }
        }
        return Double.NaN;
    }

    @Test
    void aMoverDecidesTheSameInAHugeZoneAsInASmallOne() {
        // the small zone: about 40 × 60 px around the mover's way; the huge one: the whole picture (≈ 24 times
        // larger, so the mover's share of it is 24 times smaller)
        double small = startIn(new double[] {0.44, 0.56, 0.56, 0.44}, new double[] {0.25, 0.25, 0.6, 0.6});
        double huge = startIn(new double[] {0, 1, 1, 0}, new double[] {0, 0, 1, 1});
        assertTrue(!Double.isNaN(small), "no event in the small zone");
        assertEquals(small, huge, 1e-9);
        // analytic: 2 px a frame reaches 10 px at the 5th frame; the hold (0.5 s from the first frame) at the 6th
        assertEquals(0.6, small, 1e-9);
    }

    @Test
    void settingsOutOfRangeAreRefused() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> new MoverRuleSettings(0.5, 1, 2, 10, 5, 48));
        assertEquals("quickTravelPx: 5.0 (expected at least minTravelPx 10.0)", e.getMessage());
    }
}
