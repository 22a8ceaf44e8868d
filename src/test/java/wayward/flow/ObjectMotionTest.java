package wayward.flow;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.bytedeco.opencv.opencv_video.DISOpticalFlow;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.params.provider.ValueSource;
import wayward.flow.ObjectMotionCase.BackgroundKind;
import wayward.flow.ObjectMotionCase.TextureKind;

/**
 * Checks of the object-motion benchmark itself ({@link ObjectMotionBench}, {@link ObjectMotionCase}): that its
 * rendering is exact, that its scores mean what they say, and that a strong reference method reaches a sane level
 * on representative cases, which would not happen if the truth were wrong. No targets for wayward's estimator here.
 */
class ObjectMotionTest {
    private static final int W = ObjectMotionCase.WIDTH;
    private static final int H = ObjectMotionCase.HEIGHT;
    /** Seeds per representative case; the checks use the mean over them (one unlucky placement must not decide). */
    private static final long[] SEEDS = {11, 12, 13};

    private static ObjectMotionCase oneCase(BackgroundKind bg, String bgPhoto, int size, TextureKind texture,
            String texPhoto, double motion, double angle, double noise, long seed) {
        return new ObjectMotionCase(ObjectMotionBench.Half.TUNE, 0, bg, bgPhoto, size, texture, texPhoto, motion,
                angle, noise, seed);
    }

    // analytic truth: a plain background makes every pixel of the second frame a pure translation of the first
    @ParameterizedTest(name = "{0}")
    @MethodSource("textures")
    void integerDisplacementReproducesTheSamePixelsShifted(TextureKind texture) {
        // 3 px right and 2 px up: cos and sin of the angle give the integers up to 1e-15 px
        double angle = Math.toDegrees(Math.atan2(-2, 3));
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 20, texture,
                texture == TextureKind.PHOTO ? "butterfly.jpg" : null, Math.hypot(3, 2), angle, 0, 5);
        ObjectMotionCase.Frames f = c.render();
        int differ = 0;
        for (int y = 2; y < H; y++) {
            for (int x = 0; x < W - 3; x++) {
                if (f.first()[y * W + x] != f.second()[(y - 2) * W + x + 3]) {
                    differ++;
                }
            }
        }
        assertEquals(0, differ, "pixels of frame 2 that are not frame 1 moved by (3, -2)");
    }

    // analytic truth: a plain case moved by (4, -2) px shrunk 2 × 2 is the same scene moved by (2, -1) px, every
    // shrunk pixel the rounded mean of its block, the object the blocks wholly inside it
    @Test
    void aShrunkCaseIsTheSceneAtHalfTheResolution() {
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 20, TextureKind.RIM, null, Math.hypot(4, 2),
                Math.toDegrees(Math.atan2(-2, 4)), 0, 6);
        ObjectMotionCase.Frames f = c.render();
        ObjectMotionCase.Frames s = f.shrunk(2);
        int w = W / 2;
        int h = H / 2;
        assertEquals(w * h, s.first().length);
        assertEquals(2, s.dx(), 1e-9);
        assertEquals(-1, s.dy(), 1e-9);
        int objectPixels = 0;
        int differ = 0;
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int i = 2 * y * W + 2 * x;
                int sum = (f.first()[i] & 0xff) + (f.first()[i + 1] & 0xff) + (f.first()[i + W] & 0xff)
                        + (f.first()[i + W + 1] & 0xff);
                assertEquals((sum + 2) / 4, s.first()[y * w + x] & 0xff);
                assertEquals(f.object()[i] && f.object()[i + 1] && f.object()[i + W] && f.object()[i + W + 1],
                        s.object()[y * w + x]);
                objectPixels += s.object()[y * w + x] ? 1 : 0;
                if (y >= 1 && x < w - 2 && s.first()[y * w + x] != s.second()[(y - 1) * w + x + 2]) {
                    differ++;
                }
            }
        }
        // a 20 px square covers 10 × 10 whole blocks where it starts on an even pixel, 9 × 9 otherwise
        assertTrue(objectPixels == 81 || objectPixels == 90 || objectPixels == 100, "object blocks: " + objectPixels);
        assertEquals(0, differ, "shrunk pixels of frame 2 that are not frame 1's moved by (2, -1)");
        assertEquals(f, f.shrunk(1));
    }

    static Stream<TextureKind> textures() {
        return Stream.of(TextureKind.values());
    }

    // analytic truth: on a photo background, pixels the object touches in neither frame stay exactly the same
    // (no noise), and the object's inner pixels (whole pixels inside it in both frames) move by the integer shift
    @Test
    void stillBackgroundStaysAndTheObjectInteriorMovesOnAPhotoBackground() {
        ObjectMotionCase c = oneCase(BackgroundKind.PHOTO, "building.jpg", 32, TextureKind.PHOTO, "smarties.png", 4,
                180, 0, 8);
        ObjectMotionCase.Exact e = c.renderExact();
        ObjectMotionCase.Frames f = c.render();
        int inner = 0;
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                int i = y * W + x;
                if (e.cover1()[i] == 0 && e.cover2()[i] == 0) {
                    assertEquals(f.first()[i], f.second()[i], "still pixel " + x + "," + y);
                }
                if (e.cover1()[i] == 1 && x >= 4 && e.cover2()[i - 4] == 1) {
                    assertEquals(f.first()[i], f.second()[i - 4], "object pixel " + x + "," + y);
                    inner++;
                }
            }
        }
        // a 32 px square at a sub-pixel position has 31 × 31 whole pixels
        assertEquals(31 * 31, inner);
    }

    // analytic truth: area integration keeps the integral of (frame − background) over plain grey whatever the
    // sub-pixel position (exact for plain paint and the rim, up to the 4×4 midpoint rule for smooth textures)
    @ParameterizedTest(name = "{0} moved {1} px at {2} deg")
    @MethodSource("subPixelCases")
    void subPixelMotionKeepsTheObjectsMass(TextureKind texture, double motion, double angle) {
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 20, texture,
                texture == TextureKind.PHOTO ? "messi5.jpg" : null, motion, angle, 0, 21);
        ObjectMotionCase.Exact e = c.renderExact();
        double[] m1 = moments(e.first(), e.background());
        double[] m2 = moments(e.second(), e.background());
        boolean exact = texture == TextureKind.PLAIN || texture == TextureKind.RIM;
        // mass relative to the object's area × 100 grey levels, so a near-zero mass (texture ≈ grey) still counts
        assertEquals(m1[0], m2[0], (exact ? 1e-9 : 1e-3) * 20 * 20 * 100, "mass");
    }

    static Stream<Arguments> subPixelCases() {
        return Stream.of(Arguments.of(TextureKind.PLAIN, 0.5, 0), Arguments.of(TextureKind.PLAIN, 1.3, 200),
                Arguments.of(TextureKind.RIM, 0.5, 77), Arguments.of(TextureKind.RIM, 2.7, 315),
                Arguments.of(TextureKind.PHOTO, 0.5, 33), Arguments.of(TextureKind.PROCEDURAL, 1.7, 160));
    }

    // analytic truth: a plain square of integer side has its two edges at the same sub-pixel phase, so the
    // centroid of its area-integrated picture is its true centre and moves by exactly the displacement (for the
    // rim this does not hold: its inner edges sit at other phases, and a box filter shifts a step's centroid by a
    // phase-dependent amount)
    @ParameterizedTest(name = "moved {0} px at {1} deg")
    @MethodSource("plainMotions")
    void subPixelMotionMovesAPlainSquaresCentroidExactly(double motion, double angle) {
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 20, TextureKind.PLAIN, null, motion, angle, 0, 21);
        ObjectMotionCase.Exact e = c.renderExact();
        double[] m1 = moments(e.first(), e.background());
        double[] m2 = moments(e.second(), e.background());
        assertEquals(e.ox() + 10, m1[1] / m1[0], 1e-9, "centre x, frame 1");
        assertEquals(e.oy() + 10, m1[2] / m1[0], 1e-9, "centre y, frame 1");
        assertEquals(c.dx(), m2[1] / m2[0] - m1[1] / m1[0], 1e-9, "centroid shift x");
        assertEquals(c.dy(), m2[2] / m2[0] - m1[2] / m1[0], 1e-9, "centroid shift y");
    }

    static Stream<Arguments> plainMotions() {
        return Stream.of(Arguments.of(0.5, 0), Arguments.of(1.3, 200), Arguments.of(6, 113));
    }

    /** Mass and first moments of (frame − background): {Σ d, Σ x·d, Σ y·d}. */
    private static double[] moments(double[] frame, double[] bg) {
        double[] m = new double[3];
        for (int y = 0; y < H; y++) {
            for (int x = 0; x < W; x++) {
                double d = frame[y * W + x] - bg[y * W + x];
                m[0] += d;
                m[1] += x * d;
                m[2] += y * d;
            }
        }
        return m;
    }

    // analytic truth: a half-pixel move of a plain square on plain grey leaves a pixel column half covered;
    // its value is the mean of paint and background
    @Test
    void halfPixelMoveGivesHalfCoveredEdgePixels() {
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 12, TextureKind.PLAIN, null, 0.5, 0, 0, 3);
        ObjectMotionCase.Exact e = c.renderExact();
        int y = (int) Math.ceil(e.oy()) + 5;
        int x = (int) Math.ceil(e.ox()) + 5;
        double paint = e.first()[y * W + x];
        double grey = e.background()[0];
        // every pixel of the row mixes paint and grey by the area the square covers, in both frames
        for (int xx = 0; xx < W; xx++) {
            double c1 = e.cover1()[y * W + xx];
            double c2 = e.cover2()[y * W + xx];
            assertEquals((1 - c1) * grey + c1 * paint, e.first()[y * W + xx], 1e-9, "frame 1 pixel " + xx + "," + y);
            assertEquals((1 - c2) * grey + c2 * paint, e.second()[y * W + xx], 1e-9, "frame 2 pixel " + xx + "," + y);
            // the square [ox, ox + 12) moved to [ox + 0.5, ox + 12.5): exact overlap with pixel [xx − ½, xx + ½]
            double expected2 = Math.max(0, Math.min(xx + 0.5, e.ox() + 12.5) - Math.max(xx - 0.5, e.ox() + 0.5));
            assertEquals(expected2, c2, 1e-12, "coverage " + xx);
        }
        // total coverage of the row is the object's width in both frames
        double row1 = 0;
        double row2 = 0;
        for (int xx = 0; xx < W; xx++) {
            row1 += e.cover1()[y * W + xx];
            row2 += e.cover2()[y * W + xx];
        }
        assertEquals(12, row1, 1e-9);
        assertEquals(12, row2, 1e-9);
    }

    // analytic truth: the masks follow their definitions (object = centre inside the first frame's square;
    // ring = within 7 px, touched by the object in neither frame)
    @Test
    void ringExcludesEverythingTheObjectTouches() {
        ObjectMotionCase c = oneCase(BackgroundKind.PLAIN, null, 8, TextureKind.RIM, null, 8, 45, 2.5, 4);
        ObjectMotionCase.Exact e = c.renderExact();
        ObjectMotionCase.Frames f = c.render();
        int object = 0;
        int ring = 0;
        for (int i = 0; i < W * H; i++) {
            if (f.object()[i]) {
                object++;
                assertFalse(f.ring()[i]);
            }
            if (f.ring()[i]) {
                ring++;
                assertEquals(0, e.cover1()[i]);
                assertEquals(0, e.cover2()[i]);
            }
        }
        assertEquals(64, object, "an 8 px square holds 64 pixel centres");
        assertTrue(ring > 200, "ring pixels: " + ring);
    }

    // analytic truth: the scorer gives the truth itself a perfect score and a zero flow none of the object
    @Test
    void truthScoresPerfectAndZeroFlowScoresNothing() {
        ObjectMotionCase c = oneCase(BackgroundKind.PHOTO, "fruits.jpg", 20, TextureKind.PROCEDURAL, null, 1, 150, 2.5,
                9);
        ObjectMotionCase.Frames f = c.render();
        FlowField truth = new FlowField(W, H);
        for (int i = 0; i < W * H; i++) {
            if (f.object()[i]) {
                truth.u[i] = (float) f.dx();
                truth.v[i] = (float) f.dy();
            }
        }
        ObjectMotionBench.Score best = ObjectMotionBench.score(truth, f, ObjectMotionBench.BILINEAR);
        assertEquals(1, best.caught());
        assertEquals(0, best.objectEpe(), 1e-6);
        assertEquals(0, best.ringEpe());
        ObjectMotionBench.Score none = ObjectMotionBench.score(new FlowField(W, H), f, ObjectMotionBench.BILINEAR);
        assertEquals(0, none.caught());
        assertEquals(1, none.objectEpe(), 1e-9);
        assertEquals(0, none.ringEpe());
    }

    // the caught rule as stated in ObjectMotionBench's javadoc (the "within 1 px or 30 deg", capped)
    @Test
    void caughtRuleFollowsItsStatement() {
        assertFalse(ObjectMotionBench.caught(0, 0, 0.5, 0), "zero flow never catches a small motion");
        assertFalse(ObjectMotionBench.caught(0, 0, 1, 0));
        assertTrue(ObjectMotionBench.caught(0.3, 0, 0.5, 0), "within |t|/2 of a 0.5 px truth");
        assertTrue(ObjectMotionBench.caught(4.9, 0.9, 4, 0), "within 1 px of a 4 px truth");
        assertTrue(ObjectMotionBench.caught(3, 1.6, 4, 0), "28 deg off, longer than half");
        assertFalse(ObjectMotionBench.caught(3, 1.9, 4, 0), "32 deg off and 1.6 px away");
        assertTrue(ObjectMotionBench.caught(20, 0, 4, 0), "long but right direction: caught");
        assertFalse(ObjectMotionBench.caught(1.9, 0, 4, 0), "right direction, shorter than half");
    }

    // the benchmark needs its dataset: a missing file fails with the package's name, it does not skip
    @Test
    void missingPhotographNamesTheDebianPackage() {
        IllegalStateException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalStateException.class,
                () -> ObjectMotionCase.photo("no-such-photo.jpg", true));
        assertTrue(e.getMessage().contains("opencv-doc"), e.getMessage());
    }

    // reference library: OpenCV DIS (Kroeger et al. 2016), preset MEDIUM, through JavaCV, on the same cases: every
    // 11th case of the held-out half (photographs no default was chosen on; 11: prime to the factors' levels). Ours must catch at least as much of
    // the objects, with an object EPE no worse than DIS MEDIUM's + 0.1 px and a smaller ring EPE (measured
    // 2026-12-03 on all 480 held-out cases: ours 0.84 / 0.80 / 0.74, DIS MEDIUM 0.79 / 0.87 / 1.94)
    @Test
    void oursHoldsMoversAtLeastAsWellAsDisMedium() {
        List<ObjectMotionCase> cases = ObjectMotionBench.cases(ObjectMotionBench.Half.HELD_OUT, 11);
        ObjectMotionBench.Score ours = ObjectMotionBench.score(FlowSettings.defaults(), cases).mean();
        ObjectMotionBench.Score dis;
        try (ObjectMotionBench.Method m = ObjectMotionBench.dis("OpenCV DIS MEDIUM", DISOpticalFlow.PRESET_MEDIUM)) {
            dis = ObjectMotionBench.score(m, cases, ObjectMotionBench.BILINEAR).mean();
        }
        String measured = String.format(Locale.ROOT, "%d cases, caught / object EPE / ring EPE: ours %.2f / %.2f / "
                + "%.2f, DIS MEDIUM %.2f / %.2f / %.2f", cases.size(), ours.caught(), ours.objectEpe(), ours.ringEpe(),
                dis.caught(), dis.objectEpe(), dis.ringEpe());
        System.out.println(measured);
        assertTrue(ours.caught() >= dis.caught(), measured);
        assertTrue(ours.objectEpe() <= dis.objectEpe() + 0.1, measured);
        assertTrue(ours.ringEpe() < dis.ringEpe(), measured);
    }

    // analytic truth (the renderer places the object): a mover of 8-12 px that jumps 6-8 px, farther than its own
    // size, between the frames over a still photograph (Debian opencv-doc graf1.png, smarties.png). On the coarse
    // levels it is gone, and on the half-size level the grid points lie 8 px apart; only the full-size level's
    // search finds it. Measured 2026-12-04 on these seeds, caught / object EPE: with it 0.98 / 0.49, 0.90 / 0.67,
    // 0.82 / 1.80 px; without it 0.66 / 2.41, 0.67 / 1.83, 0.02 / 7.20 px (each case below the caught floor)
    @ParameterizedTest(name = "{0}")
    @MethodSource("jumpingMovers")
    void aSmallMoverThatJumpsFartherThanItsSizeIsFound(String name, List<ObjectMotionCase> cases) {
        ObjectMotionBench.Score s = ObjectMotionBench.score(FlowSettings.defaults(), cases).mean();
        double motion = cases.get(0).motionPx();
        String measured = String.format(Locale.ROOT, "%s: caught %.2f, object EPE %.2f px, ring EPE %.2f px", name,
                s.caught(), s.objectEpe(), s.ringEpe());
        System.out.println(measured);
        assertTrue(s.caught() >= 0.75, measured);
        assertTrue(s.objectEpe() <= 0.3 * motion, measured);
    }

    static Stream<Arguments> jumpingMovers() {
        return Stream.of(
                Arguments.of("8 px photo patch on a photo, 6 px at 80 deg, noise 2.5",
                        seeds(BackgroundKind.PHOTO, "graf1.png", 8, TextureKind.PHOTO, "smarties.png", 6, 80, 2.5)),
                Arguments.of("8 px plain with a rim on a photo, 6 px at 270 deg, no noise",
                        seeds(BackgroundKind.PHOTO, "graf1.png", 8, TextureKind.RIM, null, 6, 270, 0)),
                Arguments.of("12 px procedural on a photo, 8 px at 317 deg, no noise",
                        seeds(BackgroundKind.PHOTO, "graf1.png", 12, TextureKind.PROCEDURAL, null, 8, 317, 0)));
    }

    // analytic truth: a mover over plain grey ground in sensor noise of σ 6 (the levels that tell structure from
    // flat ground were chosen at σ 2.5); the ground around it is still. Measured 2026-12-05, ring EPE (within 7 px of
    // the mover), three seeds' mean, in table order: with the flat settle's levels fixed 3.95 / 1.94 / 6.03 px, grown
    // with the noise in the dense output 0.56 / 0.16 / 0.60 px (caught 0.96 / 1.00 / 0.98); the limits are those
    // with headroom
    @ParameterizedTest(name = "{0}")
    @MethodSource("noisyPlainGround")
    void aMoversMotionDoesNotFloodNoisyPlainGround(String name, List<ObjectMotionCase> cases, double maxRing) {
        ObjectMotionBench.Score s = ObjectMotionBench.score(FlowSettings.defaults(), cases).mean();
        String measured = String.format(Locale.ROOT, "%s: caught %.2f, object EPE %.2f px, ring EPE %.2f px", name,
                s.caught(), s.objectEpe(), s.ringEpe());
        System.out.println(measured);
        assertTrue(s.ringEpe() <= maxRing, measured + " (ring EPE limit " + maxRing + ")");
        assertTrue(s.caught() >= 0.9, measured);
    }

    static Stream<Arguments> noisyPlainGround() {
        return Stream.of(
                Arguments.of("32 px procedural on plain grey, 4 px at 30 deg, noise 6",
                        seeds(BackgroundKind.PLAIN, null, 32, TextureKind.PROCEDURAL, null, 4, 30, 6), 1.0),
                Arguments.of("20 px photo patch on plain grey, 2 px at 200 deg, noise 6",
                        seeds(BackgroundKind.PLAIN, null, 20, TextureKind.PHOTO, "board.jpg", 2, 200, 6), 0.5),
                Arguments.of("32 px plain with a rim on plain grey, 6 px at 120 deg, noise 6",
                        seeds(BackgroundKind.PLAIN, null, 32, TextureKind.RIM, null, 6, 120, 6), 1.0));
    }

    // analytic truth: one scene filmed at 320×240 and at twice that resolution (the background a photograph of
    // Debian's opencv-doc, graf1.png, and the mover a procedural texture, both sampled at the same scene positions;
    // a mover of 20 px jumping 8 px at the reference size, three seeds). The searches' and the flat settle's reaches
    // were chosen at 320×240; fixed in pixels, they missed the jump at twice the size. Measured 2026-12-05, caught /
    // object EPE: ×1 0.81 / 1.87 px; ×2 0.27 / 11.3 px with the reaches fixed, 0.78 / 4.38 px growing with the
    // picture (at ×3, not held here: 0.15 / 19.8 and 0.52 / 11.7 px)
    @ParameterizedTest(name = "scale {0}")
    @ValueSource(ints = {1, 2})
    void theSameJumpIsFoundAtEveryResolution(int scale) throws IOException {
        ImageTexture photo = ImageTexture.load(ImageTexture.DATA.resolve("graf1.png"), 2);
        int w = 320 * scale;
        int h = 240 * scale;
        double caught = 0;
        double epe = 0;
        int seeds = 3;
        for (int seed = 0; seed < seeds; seed++) {
            SplittableRandom r = new SplittableRandom(31 + seed);
            Textures paint = new Textures(r.nextLong(), 12);
            double angle = Math.toRadians(40 + 110 * seed);
            double size = 20 * scale;
            double ox = (140 + 8 * seed) * scale;
            double oy = (100 + 6 * seed) * scale;
            double dx = 8 * scale * Math.cos(angle);
            double dy = 8 * scale * Math.sin(angle);
            byte[] a = frame(photo, paint, w, h, ox, oy, size, scale, r);
            byte[] b = frame(photo, paint, w, h, ox + dx, oy + dy, size, scale, r);
            FlowField d = FlowEstimator.create(w, h, FlowSettings.defaults()).computeDense(a, b);
            int n = 0;
            int hit = 0;
            double sum = 0;
            // the object's pixels, a pixel in from its outline
            for (int y = (int) Math.ceil(oy) + 1; y < oy + size - 1; y++) {
                for (int x = (int) Math.ceil(ox) + 1; x < ox + size - 1; x++) {
                    int i = y * w + x;
                    sum += Math.hypot(d.u[i] - dx, d.v[i] - dy);
                    hit += ObjectMotionBench.caught(d.u[i], d.v[i], dx, dy) ? 1 : 0;
                    n++;
                }
            }
            caught += (double) hit / n / seeds;
            epe += sum / n / seeds;
        }
        String measured = String.format(Locale.ROOT, "scale %d: caught %.2f, object EPE %.2f px (motion %d px)", scale,
                caught, epe, 8 * scale);
        System.out.println(measured);
        assertTrue(caught >= 0.65, measured);
        assertTrue(epe <= 0.35 * 8 * scale, measured);
    }

    /** The scene at the given scale: the photograph, and the mover's paint, at scene position (x, y) / scale. */
    private static byte[] frame(ImageTexture photo, Textures paint, int w, int h, double ox, double oy, double size,
            int scale, SplittableRandom r) {
        return Textures.of((x, y) -> x >= ox && x < ox + size && y >= oy && y < oy + size
                ? paint.at(2 * (x - ox) / scale, 2 * (y - oy) / scale) : photo.at(x / scale, y / scale))
                .render(w, h, 0, 0, 1.0, r);
    }

    // reference library: OpenCV DIS (Kroeger et al. 2016), preset MEDIUM, OpenCV 4.13 through JavaCV; dataset:
    // opencv-doc photographs (Debian package opencv-doc). The issue asks that DIS MEDIUM catch at least 0.6 of a
    // 32 px textured object moved 4 px; the other limits are the measured means over 3 seeds (2026-12-03:
    // caught 0.98 / 1.00 / 0.99 / 1.00, object EPE 0.49 / 0.19 / 0.33 / 0.14 px, ring EPE 1.27 / 1.83 / 2.22 /
    // 1.34 px, in table order) with headroom
    @ParameterizedTest(name = "{0}")
    @MethodSource("referenceCases")
    void disMediumCatchesRepresentativeObjects(String name, List<ObjectMotionCase> cases, double minCaught,
            double maxObjectEpe, double maxRingEpe) {
        ObjectMotionBench.Result r;
        try (ObjectMotionBench.Method dis = ObjectMotionBench.dis("OpenCV DIS MEDIUM", DISOpticalFlow.PRESET_MEDIUM)) {
            r = ObjectMotionBench.score(dis, cases, ObjectMotionBench.BILINEAR);
        }
        ObjectMotionBench.Score s = r.mean();
        String measured = String.format(Locale.ROOT, "%s: caught %.2f, object EPE %.2f px, ring EPE %.2f px", name,
                s.caught(), s.objectEpe(), s.ringEpe());
        System.out.println(measured);
        assertTrue(s.caught() >= minCaught, measured + " (floor " + minCaught + ")");
        assertTrue(s.objectEpe() <= maxObjectEpe, measured + " (object EPE limit " + maxObjectEpe + ")");
        assertTrue(s.ringEpe() <= maxRingEpe, measured + " (ring EPE limit " + maxRingEpe + ")");
    }

    static Stream<Arguments> referenceCases() {
        return Stream.of(
                Arguments.of("32 px photo patch on a photo, 4 px at 30 deg, noise 2.5",
                        seeds(BackgroundKind.PHOTO, "building.jpg", 32, TextureKind.PHOTO, "butterfly.jpg", 4, 30,
                                2.5), 0.6, 1.0, 2.0),
                Arguments.of("20 px plain with a rim on grey, 2 px at 135 deg, noise 2.5",
                        seeds(BackgroundKind.PLAIN, null, 20, TextureKind.RIM, null, 2, 135, 2.5), 0.8, 0.5, 2.5),
                Arguments.of("48 px procedural on a photo, 6 px at 250 deg, no noise",
                        seeds(BackgroundKind.PHOTO, "home.jpg", 48, TextureKind.PROCEDURAL, null, 6, 250, 0), 0.8,
                        0.8, 3.0),
                Arguments.of("12 px photo patch on grey, 1 px at 300 deg, noise 2.5",
                        seeds(BackgroundKind.PLAIN, null, 12, TextureKind.PHOTO, "messi5.jpg", 1, 300, 2.5), 0.8, 0.4,
                        2.0));
    }

    private static List<ObjectMotionCase> seeds(BackgroundKind bg, String bgPhoto, int size, TextureKind texture,
            String texPhoto, double motion, double angle, double noise) {
        List<ObjectMotionCase> out = new ArrayList<>();
        for (long seed : SEEDS) {
            out.add(oneCase(bg, bgPhoto, size, texture, texPhoto, motion, angle, noise, seed));
        }
        return out;
    }

    // dataset: the halves use disjoint photographs, and the cases are the full factorial design
    @Test
    void halvesAreDisjointAndComplete() {
        List<ObjectMotionCase> tune = ObjectMotionBench.cases(ObjectMotionBench.Half.TUNE);
        List<ObjectMotionCase> held = ObjectMotionBench.cases(ObjectMotionBench.Half.HELD_OUT);
        assertEquals(480, tune.size());
        assertEquals(480, held.size());
        for (ObjectMotionCase t : tune) {
            assertEquals(0, t.seed() % 2);
            assertTrue(t.backgroundPhoto() == null || !held.get(0).half().backgrounds.contains(t.backgroundPhoto()));
            assertTrue(t.texturePhoto() == null || !held.get(0).half().objects.contains(t.texturePhoto()));
            assertTrue(t.texturePhoto() == null || !t.half().backgrounds.contains(t.texturePhoto()));
        }
        for (ObjectMotionCase h : held) {
            assertEquals(1, h.seed() % 2);
        }
        assertEquals(69, ObjectMotionBench.cases(ObjectMotionBench.Half.TUNE, ObjectMotionBench.FAST_EVERY).size());
    }
}
