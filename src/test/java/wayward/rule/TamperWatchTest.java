package wayward.rule;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import wayward.event.Event;
import wayward.event.EventKind;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.testing.SchemaCheck;

/**
 * The moved-camera check against pictures shifted by a known whole number of pixels (the truth is the shift
 * the test applies): a scene with texture at every scale, 10 frames a second with fresh sensor noise in each,
 * cut from a larger canvas at an offset that jumps once.
 */
class TamperWatchTest {
    private static final int W = 320;
    private static final int H = 180;
    private static final int MARGIN = 24;

    private static int[] canvas() {
        SplittableRandom r = new SplittableRandom(7);
        int cw = W + 2 * MARGIN;
        int ch = H + 2 * MARGIN;
        int[] c = new int[cw * ch];
        // blobs of several sizes on a gradient, like parked trailers, lane marks and gravel
        for (int y = 0; y < ch; y++) {
            for (int x = 0; x < cw; x++) {
                c[y * cw + x] = 70 + 60 * x / cw + 20 * y / ch;
            }
        }
        for (int i = 0; i < 120; i++) {
            int bx = r.nextInt(cw);
            int by = r.nextInt(ch);
            int size = 2 + r.nextInt(14);
            int v = r.nextInt(-60, 61);
            for (int y = Math.max(0, by - size); y < Math.min(ch, by + size); y++) {
                for (int x = Math.max(0, bx - size); x < Math.min(cw, bx + size); x++) {
                    c[y * cw + x] += v;
                }
            }
        }
        return c;
    }

    /** Runs 4 s at offset (0, 0), then 5 s with the picture's content moved by (dx, dy) pixels. */
    private static List<Event> run(int dx, int dy, TamperWatch[] watchOut) {
        int[] c = canvas();
        int cw = W + 2 * MARGIN;
        SplittableRandom noise = new SplittableRandom(11);
        TamperWatch w = new TamperWatch("yard-gate-1", Clock.systemUTC());
        watchOut[0] = w;
        FlowField field = new FlowField(W, H, 4);
        GrayFrame f = new GrayFrame(W, H);
        List<Event> events = new ArrayList<>();
        for (int i = 0; i < 90; i++) {
            double t = i / 10.0;
            // content moved right by dx: the camera now sees at x what was at x - dx
            int ox = MARGIN - (t >= 4 ? dx : 0);
            int oy = MARGIN - (t >= 4 ? dy : 0);
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    int v = c[(y + oy) * cw + x + ox] + noise.nextInt(-3, 4);
                    f.pixels[y * W + x] = (byte) Math.max(0, Math.min(255, v));
                }
            }
            w.update(f, field, t);
            for (Event e; (e = w.poll()) != null; ) {
                events.add(e);
            }
        }
        return events;
    }

    /** Runs 4 s of the still canvas, then 6 s with {@code after} applied to each frame (in place). */
    private static List<Event> runWith(java.util.function.Consumer<int[]> after) {
        int[] c = canvas();
        int cw = W + 2 * MARGIN;
        SplittableRandom noise = new SplittableRandom(11);
        TamperWatch w = new TamperWatch("yard-gate-1", Clock.systemUTC());
        FlowField field = new FlowField(W, H, 4);
        GrayFrame f = new GrayFrame(W, H);
        int[] v = new int[W * H];
        List<Event> events = new ArrayList<>();
        for (int i = 0; i < 100; i++) {
            double t = i / 10.0;
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    v[y * W + x] = c[(y + MARGIN) * cw + x + MARGIN] + noise.nextInt(-3, 4);
                }
            }
            if (t >= 4) {
                after.accept(v);
            }
            for (int k = 0; k < v.length; k++) {
                f.pixels[k] = (byte) Math.max(0, Math.min(255, v[k]));
            }
            w.update(f, field, t);
            for (Event e; (e = w.poll()) != null; ) {
                events.add(e);
            }
        }
        return events;
    }

    private static long starts(List<Event> events, EventKind kind) {
        return events.stream().filter(e -> e.kind() == kind && e.phase() == Event.Phase.START).count();
    }

    /**
     * The picture figures against their definitions worked out here the plain way (analytic: means of 2×2 and
     * 8×8 blocks in floating point), on random pictures of an even and an odd size: the watch sums the blocks as
     * integers, which must give the very same numbers.
     */
    @Test
    void pictureFiguresFollowTheirDefinitions() {
        SplittableRandom r = new SplittableRandom(3);
        for (int[] size : new int[][] {{W, H}, {37, 23}}) {
            int w = size[0];
            int h = size[1];
            TamperWatch watch = new TamperWatch("yard-gate-1", Clock.systemUTC());
            GrayFrame f = new GrayFrame(w, h);
            for (int i = 0; i < 3; i++) {
                for (int k = 0; k < f.pixels.length; k++) {
                    f.pixels[k] = (byte) r.nextInt(256);
                }
                watch.update(f, null, i);
            }
            int bw = w / 2;
            int bh = h / 2;
            double[] b = new double[bw * bh];
            for (int y = 0; y < bh; y++) {
                for (int x = 0; x < bw; x++) {
                    int k = 2 * y * w + 2 * x;
                    b[y * bw + x] = ((f.pixels[k] & 0xff) + (f.pixels[k + 1] & 0xff) + (f.pixels[k + w] & 0xff)
                            + (f.pixels[k + w + 1] & 0xff)) / 4.0;
                }
            }
            double sum = 0;
            double sum2 = 0;
            int n = 0;
            for (int y = 0; y + 4 <= bh; y += 4) {
                for (int x = 0; x + 4 <= bw; x += 4) {
                    double m = 0;
                    for (int j = 0; j < 4; j++) {
                        for (int i = 0; i < 4; i++) {
                            m += b[(y + j) * bw + x + i];
                        }
                    }
                    m /= 16;
                    sum += m;
                    sum2 += m * m;
                    n++;
                }
            }
            double spread = Math.sqrt(sum2 / n - (sum / n) * (sum / n));
            double detail = 0;
            int pairs = 0;
            for (int y = 0; y + 1 < bh; y++) {
                for (int x = 0; x + 1 < bw; x++) {
                    detail += Math.abs(b[y * bw + x + 1] - b[y * bw + x]) + Math.abs(b[(y + 1) * bw + x] - b[y * bw + x]);
                    pairs += 2;
                }
            }
            detail /= pairs;
            assertEquals(spread, watch.figures().spread(), 0.0, w + "x" + h);
            assertEquals(detail / spread, watch.figures().ratio(), 0.0, w + "x" + h);
        }
    }

    /**
     * Every pixel counts towards a still pair, also an odd last column or row outside the 2×2 blocks: frames a
     * second apart, so that the running stillness is the last pair's verdict (under 0.2 % of the pixels changed
     * by more than one grey level).
     */
    @Test
    void theLastColumnAndRowOfAnOddPictureCountForStillness() {
        int w = 37;
        int h = 23;
        TamperWatch watch = new TamperWatch("yard-gate-1", Clock.systemUTC());
        GrayFrame f = new GrayFrame(w, h);
        SplittableRandom r = new SplittableRandom(5);
        for (int k = 0; k < f.pixels.length; k++) {
            f.pixels[k] = (byte) (40 + r.nextInt(150));
        }
        byte[] base = f.pixels.clone();
        watch.update(f, null, 0);
        watch.update(f, null, 1);
        assertEquals(1.0, watch.figures().stillness(), 0.0, "the same picture again");
        for (int y = 0; y < h; y++) {
            f.pixels[y * w + w - 1] += 5; // the last column: 23 of 851 pixels
        }
        watch.update(f, null, 2);
        assertEquals(0.0, watch.figures().stillness(), 0.0, "last column changed");
        System.arraycopy(base, 0, f.pixels, 0, base.length);
        watch.update(f, null, 3);
        for (int x = 0; x < w; x++) {
            f.pixels[(h - 1) * w + x] += 5; // the last row: 37 pixels
        }
        watch.update(f, null, 4);
        assertEquals(0.0, watch.figures().stillness(), 0.0, "last row changed");
        System.arraycopy(base, 0, f.pixels, 0, base.length);
        watch.update(f, null, 5);
        f.pixels[w * h - 1] += 5; // one pixel: 0.12 %, a still pair
        watch.update(f, null, 6);
        assertEquals(1.0, watch.figures().stillness(), 0.0, "one pixel changed");
    }

    @Test
    void aBlurredPictureLosesFocus() {
        // a 15×15 box blur, separable (a lens well out of focus): fine detail falls, large-scale structure stays
        List<Event> events = runWith(v -> {
            int r = 7;
            int[] tmp = new int[v.length];
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    int sum = 0;
                    for (int d = -r; d <= r; d++) {
                        sum += v[y * W + Math.max(0, Math.min(W - 1, x + d))];
                    }
                    tmp[y * W + x] = sum / (2 * r + 1);
                }
            }
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    int sum = 0;
                    for (int d = -r; d <= r; d++) {
                        sum += tmp[Math.max(0, Math.min(H - 1, y + d)) * W + x];
                    }
                    v[y * W + x] = sum / (2 * r + 1);
                }
            }
        });
        assertEquals(1, starts(events, EventKind.FOCUS_LOST), events.toString());
    }

    @Test
    void headlightGlareIsNotLostFocus() {
        // a bright soft blob (σ a tenth of the width, +160 grey levels at its centre, clipped at 255) over part of
        // the picture: it adds large-scale spread, which lowered the detail-to-spread ratio as blur does, but the
        // fine detail around it is all still there
        List<Event> events = runWith(v -> {
            double s = 0.1 * W;
            for (int y = 0; y < H; y++) {
                for (int x = 0; x < W; x++) {
                    double d2 = (x - 0.6 * W) * (x - 0.6 * W) + (y - 0.5 * H) * (y - 0.5 * H);
                    v[y * W + x] += (int) Math.round(160 * Math.exp(-d2 / (2 * s * s)));
                }
            }
        });
        assertEquals(0, starts(events, EventKind.FOCUS_LOST), events.toString());
    }

    /** Starts of camera_moved (each ends 2 s later: the new position becomes the reference). */
    private static List<Event> moved(List<Event> events) {
        return events.stream().filter(e -> e.kind() == EventKind.CAMERA_MOVED && e.phase() == Event.Phase.START)
                .toList();
    }

    @Test
    void aStillCameraIsNotMoved() {
        TamperWatch[] w = new TamperWatch[1];
        List<Event> events = run(0, 0, w);
        assertEquals(List.of(), events);
        assertEquals(0.0, w[0].figures().shift(), 1e-9);
    }

    @Test
    void findsKnownShiftsAcrossTheSearchRange() {
        // shifts in pixels; the search works in 2×2 blocks up to ±6 (±12 px)
        int[][] shifts = {{4, 0}, {0, -6}, {-8, 4}, {10, 10}, {-12, -2}, {6, -12}};
        for (int[] s : shifts) {
            TamperWatch[] w = new TamperWatch[1];
            List<Event> events = moved(run(s[0], s[1], w));
            assertEquals(1, events.size(), "shift " + s[0] + "," + s[1] + ": " + events);
            Event e = events.get(0);
            // held 1.5 s from the first registration after the jump at 4.0 s
            assertTrue(e.streamSeconds() >= 5.5 && e.streamSeconds() <= 6.5, "start at " + e.streamSeconds());
            double want = wayward.zone.ZoneMeter.bearingDeg(s[0], s[1]);
            double diff = Math.abs(((e.bearingDeg() - want) % 360 + 540) % 360 - 180);
            assertTrue(diff < 1e-6, "shift " + s[0] + "," + s[1] + ": bearing " + e.bearingDeg() + ", want " + want);
            // the shifts are whole 2×2 blocks, so the registration finds their length exactly
            assertEquals(Math.hypot(s[0], s[1]), e.shiftPx(), 1e-9, "shift " + s[0] + "," + s[1]);
            SchemaCheck.assertEventRecord(wayward.event.EventJson.toJson(e));
        }
    }

    @Test
    void aShiftUnderThreePixelsIsShakeNotAMove() {
        TamperWatch[] w = new TamperWatch[1];
        assertEquals(List.of(), moved(run(2, 0, w)));
        assertEquals(List.of(), moved(run(-2, 2, w)));
    }

    @Test
    void aPictureOfAnotherSizeStartsAfresh() {
        // a camera switched to a smaller stream mid-run: the registration must not compare across sizes
        TamperWatch w = new TamperWatch("yard-gate-1", Clock.systemUTC());
        SplittableRandom r = new SplittableRandom(3);
        List<Event> events = new ArrayList<>();
        int[][] sizes = {{W, H}, {160, 120}};
        double t = 0;
        for (int[] size : sizes) {
            GrayFrame f = new GrayFrame(size[0], size[1]);
            FlowField field = new FlowField(size[0], size[1], 4);
            for (int i = 0; i < 40; i++, t += 0.1) {
                for (int p = 0; p < f.pixels.length; p++) {
                    f.pixels[p] = (byte) (80 + (p % size[0]) / 3 + r.nextInt(-3, 4));
                }
                w.update(f, field, t);
                for (Event e; (e = w.poll()) != null; ) {
                    events.add(e);
                }
            }
        }
        assertEquals(List.of(), moved(events));
    }
}
