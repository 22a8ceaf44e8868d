package wayward.zone;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import wayward.flow.FlowField;

/**
 * The tracker on synthetic flow fields whose truth is known by construction (analytic): a 320×180 picture
 * sampled every 4 px, still textured ground (confident, zero flow) and boxes of samples moving by a set step
 * per analysed frame. Heading 0° (up the picture), so moving down (+v) is against it.
 */
class MoverTrackerTest {
    static final double DT = 0.1;
    /** The zone settings' defaults: 8 px/s, confidence 8, ±60°. */
    static final MoverSettings SETTINGS = MoverSettings.of(8, 8, 60);
    static final double CONFIDENT = 100;

    static FlowField field() {
        return new FlowField(320, 180, 4);
    }

    static ZoneMask whole(FlowField f) {
        return ZoneMask.rasterise(new double[] {0, 1, 1, 0}, new double[] {0, 0, 1, 1}, f);
    }

    /** Still, confident ground, plus Gaussian noise of {@code sigma} px on every sample's flow. */
    static void ground(FlowField f, Random noise, double sigma) {
        for (int k = 0; k < f.u.length; k++) {
            f.u[k] = noise == null ? 0 : (float) (noise.nextGaussian() * sigma);
            f.v[k] = noise == null ? 0 : (float) (noise.nextGaussian() * sigma);
            f.confidence[k] = (float) CONFIDENT;
            f.edge[k] = (float) CONFIDENT;
            f.normalX[k] = 1;
            f.normalY[k] = 0;
        }
        f.globalU = 0;
        f.globalV = 0;
    }

    /** A textured box of w×h samples with its top-left sample at pixel (x, y), moving by (u, v) px per frame. */
    static void box(FlowField f, double x, double y, int w, int h, double u, double v, Random noise, double sigma) {
        final int half = f.stride / 2; // as FlowField.pixelX places samples: whole pixels
        int i0 = (int) Math.round((x - half) / f.stride);
        int j0 = (int) Math.round((y - half) / f.stride);
        for (int j = j0; j < j0 + h; j++) {
            for (int i = i0; i < i0 + w; i++) {
                if (i < 0 || j < 0 || i >= f.width || j >= f.height) {
                    continue;
                }
                int k = j * f.width + i;
                f.u[k] = (float) (u + (noise == null ? 0 : noise.nextGaussian() * sigma));
                f.v[k] = (float) (v + (noise == null ? 0 : noise.nextGaussian() * sigma));
            }
        }
    }

    static int liveTracks(Movers m) {
        return m.count();
    }

    static double largestTravel(Movers m) {
        return m.largestTravelPx();
    }

    @Test
    void followsOneMoverAgainstTheHeadingWithItsTravel() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        // 3 samples wide, 5 tall, 3 px down per frame (30 px/s) for 1 s: 10 frames
        for (int n = 1; n <= 10; n++) {
            ground(f, null, 0);
            box(f, 150, 40 + 3 * n, 3, 5, 0, 3, null, 0);
            t.update(f, DT, n * DT, m);
        }
        assertEquals(1, liveTracks(m));
        int k = slotOf(m);
        // analytic: 10 frames × 3 px along the against direction
        assertEquals(30, m.travelPx(k), 0.5);
        assertEquals(15, m.peakSamples(k));
        assertEquals(12, m.widthPx(k));
        assertEquals(20, m.heightPx(k));
        assertEquals(30, m.speed(k), 0.5);
        assertEquals(0.9, m.ageSeconds(k), 1e-9);
        assertTrue(m.pathCount(k) >= 2);
        assertTrue(m.pathY(k, m.pathCount(k) - 1) > m.pathY(k, 0), "the path goes down the picture");
    }

    @Test
    void aFramesFlowCountsAsTravelOnlyAsFarAsTheGroupsOwnExtent() {
        // analytic: 5 frames of 3 px down, then a frame whose flow reads 20 px down while the group moved 3 px
        // (noise or flicker read as motion). A group 1 × 2 samples (4 × 8 px) counts 8 px of that frame, its box's
        // longer side; a group 3 × 6 samples (12 × 24 px) counts all 20.
        assertEquals(15 + 8, travelAfterOneLongReading(1, 2), 0.5);
        assertEquals(15 + 20, travelAfterOneLongReading(3, 6), 0.5);
    }

    private static double travelAfterOneLongReading(int w, int h) {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 6; n++) {
            ground(f, null, 0);
            box(f, 150, 40 + 3 * n, w, h, 0, n == 6 ? 20 : 3, null, 0);
            t.update(f, DT, n * DT, m);
        }
        assertEquals(1, liveTracks(m));
        return m.travelPx(slotOf(m));
    }

    @Test
    void aSmallMoverWhoseFlowFailsOnEveryOtherJumpIsFollowedByItsCentroid() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        // 3 × 3 samples jumping 20 px down per frame (200 px/s); on every other frame the flow misreads the jump as
        // a small motion back (what a pyramid does with a 12-px object moving 26 px between two analysed frames)
        for (int n = 1; n <= 7; n++) {
            ground(f, null, 0);
            box(f, 150, 20 + 20 * n, 3, 3, 0, n % 2 == 1 ? 20 : -1, null, 0);
            t.update(f, DT, n * DT, m);
        }
        assertEquals(1, liveTracks(m), "one mover, one track");
        int k = slotOf(m);
        // analytic: 6 centroid steps of 20 px after the first frame (the flow alone: 4 × 20 − 3 × 1 = 77)
        assertEquals(120, m.travelPx(k), 0.5);
        assertTrue(m.vy(k) > 100, "the track keeps the mover's velocity: " + m.vy(k));
    }

    @Test
    void aSmallMoverThatTheFlowNeverFollowsIsFollowedByItsJumpsWithoutTravel() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        // 3 × 3 samples jumping 32 px down per frame (320 px/s, three times its size), with the flow reading a small
        // wrong motion every time (a pyramid's answer when the object is gone from one frame to the next)
        for (int n = 1; n <= 5; n++) {
            ground(f, null, 0);
            box(f, 150, 8 + 32 * (n - 1), 3, 3, 2, -1, null, 0);
            t.update(f, DT, n * DT, m);
        }
        int k = slotOf(m);
        // analytic: one track from frame 1 to frame 5 (its jumps pair it, so it is not started afresh each frame),
        // which gains no travel from them: chance clusters of noise pair alike; the picture's footprints give a
        // hopping mover its travel (HopsTest)
        assertEquals(1, liveTracks(m));
        assertEquals(4 * DT, m.ageSeconds(k), 1e-9);
        assertEquals(0, m.travelPx(k), 1e-9);
    }

    @Test
    void aSmallMoverJumpingAtOneSpeedIsFollowedWhenAnalysedFramesAreUnevenlySpaced() {
        FlowField f = field();
        // heading 270° (left): a mover going right goes against it
        MoverTracker t = new MoverTracker(whole(f), f, 270, SETTINGS, true);
        Movers m = t.newMovers();
        // 10 analysed frames a second picked from 15 are 1/15 and 2/15 s apart in turn. A 3 × 3 mover going right
        // at 450 px/s (30 and 60 px between analysed frames, out of the flow's reach: it reads a small wrong
        // motion). The flow's field lies on the earlier frame of each pair, so its moving samples show where the
        // mover was then, at t − dt
        final double speed = 450;
        double t0 = 0;
        double dt = 0;
        for (int n = 1; n <= 7; n++) {
            dt = n % 2 == 1 ? 1 / 15.0 : 2 / 15.0;
            t0 += dt;
            ground(f, null, 0);
            box(f, 8 + speed * (t0 - dt), 80, 3, 3, -1, 2, null, 0);
            t.update(f, dt, t0, m);
        }
        // analytic: one track from frame 1 to frame 7 (each jump pairs, at twice and half the step in turn, because
        // jumps are timed by where the mover was), and no travel from jumps (see the test above)
        assertEquals(1, liveTracks(m));
        assertEquals(t0 - 1 / 15.0, m.ageSeconds(slotOf(m)), 1e-9);
        assertEquals(0, largestTravel(m), 1e-9);
    }

    @Test
    void groupsFlickeringBetweenTwoPlacesGainNoTravelByJumps() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        // a 3 × 3 patch that appears 32 px lower and back again (a shaking mast, a blinking lamp): jumps that never
        // go on one way are not a run
        double maxTravel = 0;
        for (int n = 1; n <= 12; n++) {
            ground(f, null, 0);
            box(f, 150, n % 2 == 0 ? 92 : 60, 3, 3, 2, -1, null, 0);
            t.update(f, DT, n * DT, m);
            maxTravel = Math.max(maxTravel, largestTravel(m));
        }
        assertEquals(0, maxTravel, 1e-9);
    }

    @Test
    void aSlowGroupWhoseOutlineJumpsGainsNoTravelFromIt() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        // 4 × 4 samples at 1 px per frame; on frame 6 the flow reads nothing and the group is seen 12 px further on
        // (a flickering outline): below the jump the flow could miss, so it is a change of outline, not travel
        double y = 60;
        for (int n = 1; n <= 8; n++) {
            y += n == 6 ? 12 : 1;
            ground(f, null, 0);
            box(f, 150, y, 4, 4, 0, n == 6 ? 0 : 1, null, 0);
            t.update(f, DT, n * DT, m);
        }
        int k = slotOf(m);
        assertTrue(m.travelPx(k) < 10, "travel " + m.travelPx(k));
    }

    /** Travel of a 4 × 4 group whose flow reads 1 px a frame and whose centroid steps {@code steps[n]} px down. */
    private static double travelWithCentroidSteps(double... steps) {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        double y = 60;
        for (int n = 0; n < steps.length; n++) {
            y += steps[n];
            ground(f, null, 0);
            box(f, 150, y, 4, 4, 0, 1, null, 0);
            t.update(f, DT, (n + 1) * DT, m);
        }
        return m.travelPx(slotOf(m));
    }

    @Test
    void aCentroidStepCountsOnlyAsFarAsTheGroupsFlowCanExplain() {
        // analytic (steps whole grid steps, so the samples' centroid moves by exactly them): the flow reads 1 px a
        // frame, so a centroid step counts up to 4 × 1 + one stride (4 px) = 8 px
        // a plain body whose flow reads a quarter of its motion: 7 centroid steps of 4 px all count (the flow: 8)
        assertEquals(28, travelWithCentroidSteps(4, 4, 4, 4, 4, 4, 4, 4), 0.5);
        // a cluster whose centroid jumps 20 px on one frame while its flow reads 1 px: 6 × 4 + 8, not 6 × 4 + 20
        assertEquals(32, travelWithCentroidSteps(4, 4, 4, 4, 4, 20, 4, 4), 0.5);
    }

    @Test
    void stillTexturedGroundAheadOfAMoverIsFoundAndPlainGroundIsNot() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 3; n++) {
            ground(f, null, 0);
            // 4 × 4 samples (16 px) moving 3 px down per frame; its centroid 6 px below the top sample's centre
            box(f, 150, 40 + 3 * n, 4, 4, 0, 3, null, 0);
            t.update(f, DT, n * DT, m);
        }
        int k = slotOf(m);
        // analytic: the box's samples are rows j0..j0+3 (j0 = round((49 - 2) / 4) = 12, centres 50..62 px); the
        // centroid is at 56 px, the first still sample below it at row 16 (centre 66 px); stepping 2 px from the
        // centroid, 64 px is the first point whose nearest row is 16 (half-way between 62 and 66 rounds up): 8 px
        assertEquals(56, m.y(k), 1e-9);
        assertEquals(8, m.stillAheadPx(k), 1e-9);
        // the same over plain ground (no texture: neither moving nor still, nothing to tell)
        MoverTracker plain = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers pm = plain.newMovers();
        for (int n = 1; n <= 3; n++) {
            ground(f, null, 0);
            java.util.Arrays.fill(f.confidence, 0f);
            java.util.Arrays.fill(f.edge, 0f);
            box(f, 150, 40 + 3 * n, 4, 4, 0, 3, null, 0);
            int i0 = (int) Math.round((150 - 2) / 4.0);
            int j0 = (int) Math.round((40 + 3 * n - 2) / 4.0);
            for (int j = j0; j < j0 + 4; j++) {
                for (int i = i0; i < i0 + 4; i++) {
                    f.confidence[j * f.width + i] = (float) CONFIDENT;
                }
            }
            plain.update(f, DT, n * DT, pm);
        }
        assertEquals(Double.POSITIVE_INFINITY, pm.stillAheadPx(slotOf(pm)));
    }

    /** An L-shaped body, 8 × 10 samples with its lower right 3 × 4 corner still, top left at pixel (x, y). */
    private static void bodyWithNotch(FlowField f, double x, double y, double u, double v) {
        box(f, x, y, 8, 6, u, v, null, 0);
        box(f, x, y + 24, 5, 4, u, v, null, 0);
    }

    // analytic script of what Debian's tree.avi showed (a hand seen about twice a second): a 2-sample speck moving
    // its own way sits in a body's notch, inside the body's box; the next frame the body has jumped 20 px while its
    // flow read 3, so its whole group lies nearer to the speck's prediction (3 px) than to the body track's (17 px).
    // The body's track must keep its body; nearest first alone hands the body to the speck
    @Test
    void aSpeckInsideABodysBoxDoesNotTakeTheBodysGroup() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 4; n++) {
            ground(f, null, 0);
            bodyWithNotch(f, 150, 40 + 3 * n, 0, 3);
            if (n == 4) {
                box(f, 178, 40 + 3 * n + 32, 1, 2, -3, 1, null, 0);
            }
            t.update(f, DT, n * DT, m);
        }
        assertEquals(2, liveTracks(m), "the body and the speck");
        long body = -1;
        for (int k = 0; k < m.capacity(); k++) {
            if (m.live(k) && m.peakSamples(k) > 40) {
                body = m.id(k);
            }
        }
        assertTrue(body > 0);
        ground(f, null, 0);
        bodyWithNotch(f, 150, 52 + 20, 0, 3);
        t.update(f, DT, 5 * DT, m);
        int k = m.slot(body);
        assertTrue(k >= 0 && m.seen(k) && m.samples(k) > 40, "the body's track keeps the body's group");
    }

    @Test
    void twoMoversAreTwoTracks() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 10; n++) {
            ground(f, null, 0);
            box(f, 60, 40 + 3 * n, 3, 5, 0, 3, null, 0);
            box(f, 240, 40 + 4 * n, 4, 4, 0, 4, null, 0);
            t.update(f, DT, n * DT, m);
        }
        assertEquals(2, liveTracks(m));
        double[] travels = new double[2];
        int c = 0;
        for (int k = 0; k < m.capacity(); k++) {
            if (m.live(k)) {
                travels[c++] = m.travelPx(k);
            }
        }
        java.util.Arrays.sort(travels);
        assertEquals(30, travels[0], 0.5);
        assertEquals(40, travels[1], 0.5);
    }

    @Test
    void aCrowdGoingTheRightWayHasNoTravelAgainst() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        double maxTravel = 0;
        for (int n = 1; n <= 30; n++) {
            ground(f, null, 0);
            // mixed sizes and speeds, all up the picture (with the heading), some side by side
            box(f, 20, 160 - 3 * n, 2, 3, 0, -3, null, 0);
            box(f, 40, 170 - 5 * n, 6, 8, 0, -5, null, 0);
            box(f, 100, 150 - 2 * n, 3, 3, 0.5, -2, null, 0);
            box(f, 180, 175 - 4 * n, 10, 12, 0, -4, null, 0);
            box(f, 260, 165 - 6 * n, 4, 6, -0.5, -6, null, 0);
            t.update(f, DT, n * DT, m);
            for (int k = 0; k < m.capacity(); k++) {
                if (m.live(k)) {
                    maxTravel = Math.max(maxTravel, m.travelPx(k));
                }
            }
        }
        assertTrue(maxTravel <= 0.5, "largest travel against " + maxTravel);
    }

    @Test
    void noiseAloneMakesNoMover() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        Random r = new Random(16);
        double oldest = 0;
        double maxTravel = 0;
        for (int n = 1; n <= 100; n++) {
            ground(f, r, 0.3); // sensor noise, σ 0.3 px per sample (the figure), 10 s
            t.update(f, DT, n * DT, m);
            for (int k = 0; k < m.capacity(); k++) {
                if (m.live(k)) {
                    oldest = Math.max(oldest, m.ageSeconds(k));
                    maxTravel = Math.max(maxTravel, m.travelPx(k));
                }
            }
        }
        // chance clusters of a few noisy samples appear and vanish; a track may hop from one to the next (it
        // was followed for up to a few seconds here), but its travel against the heading stays under half the
        // rule's 10 px: noise goes every way and largely cancels
        assertTrue(oldest > 0, "noise made no cluster at all: the test shows nothing");
        assertTrue(maxTravel < 5, "largest noise travel " + maxTravel + " px");
    }

    @Test
    void aPlainBoxIsFollowedByTheNormalFlowOfItsRim() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 10; n++) {
            ground(f, null, 0);
            int j0 = 10 + n; // the box moves down one sample (4 px) per frame
            for (int j = j0; j < j0 + 6; j++) {
                for (int i = 30; i < 38; i++) {
                    int k = j * f.width + i;
                    boolean top = j == j0;
                    boolean bottom = j == j0 + 5;
                    boolean side = i == 30 || i == 37;
                    // plain inside: no gradient at all; its rim: straight edges, no corner texture
                    f.confidence[k] = 0;
                    f.edge[k] = top || bottom || side ? (float) CONFIDENT : 0;
                    f.normalX[k] = top || bottom ? 0 : 1;
                    f.normalY[k] = top || bottom ? 1 : 0;
                    // what a smoothing estimator gives on a plain box: anything along the edge; only the
                    // component across it is measured
                    f.u[k] = 2.5f;
                    f.v[k] = 4;
                }
            }
            t.update(f, DT, n * DT, m);
        }
        assertTrue(liveTracks(m) >= 1);
        // analytic: the top and bottom rims' normal flow is the full 4 px per frame down; the side rims'
        // normal flow (2.5 px across them) is not the box's motion, yet the least-squares velocity of the group
        // keeps the travel along the heading's axis: 10 frames × 4 px
        assertEquals(40, largestTravel(m), 2.0);
    }

    @Test
    void aCrawlInNoiseIsCaughtWithinAFewSeconds() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        Random r = new Random(7);
        double caughtAt = Double.NaN;
        for (int n = 1; n <= 50 && Double.isNaN(caughtAt); n++) {
            ground(f, r, 0.3);
            // 0.5 px per analysed frame (5 px/s, under the 8 px/s floor), σ 0.3 px per sample
            box(f, 150, 60 + 0.5 * n, 4, 6, 0, 0.5, r, 0.3);
            t.update(f, DT, n * DT, m);
            for (int k = 0; k < m.capacity(); k++) {
                if (m.live(k) && m.travelPx(k) >= 10 && m.ageSeconds(k) >= 0.5 && m.peakSamples(k) >= 3) {
                    caughtAt = n * DT;
                }
            }
        }
        assertTrue(caughtAt <= 4.0, "caught at " + caughtAt + " s");
    }

    @Test
    void aMoverThatSpillsIntoTheZoneFromBesideItDoesNotTravel() {
        FlowField f = field();
        // the zone: the right half; the mover runs down the left half with its right edge one sample inside
        ZoneMask right = ZoneMask.rasterise(new double[] {0.5, 1, 1, 0.5}, new double[] {0, 0, 1, 1}, f);
        MoverTracker t = new MoverTracker(right, f, 0, SETTINGS, true);
        Movers m = t.newMovers();
        for (int n = 1; n <= 20; n++) {
            ground(f, null, 0);
            box(f, 124, 20 + 4 * n, 10, 8, 0, 4, null, 0);
            t.update(f, DT, n * DT, m);
        }
        assertTrue(largestTravel(m) == 0, "travel " + largestTravel(m));
    }

    @Test
    void rejectsAFieldOfAnotherLayout() {
        FlowField f = field();
        MoverTracker t = new MoverTracker(whole(f), f, 0, SETTINGS, true);
        FlowField other = new FlowField(160, 90, 4);
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> t.update(other, DT, 0.1, t.newMovers()));
        assertEquals("flow: 40x22 every 4 px (expected 80x45 every 4 px)", e.getMessage());
    }

    @Test
    void settingsOutOfRangeAreRefusedWithTheirName() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> new MoverSettings(8, 8, 60, 2, 0.75, 2.5, 0.5, 16));
        assertEquals("groupAngleDeg: 2.0 (expected 5 to 80)", e.getMessage());
    }

    private static int slotOf(Movers m) {
        for (int k = 0; k < m.capacity(); k++) {
            if (m.live(k)) {
                return k;
            }
        }
        throw new AssertionError("no live track");
    }
}
