package wayward.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.analysis.CameraConfig;
import wayward.image.GrayFrame;

/**
 * The analysis picture is the source's luma shrunk by area: each output pixel the mean of the source area it
 * covers. Checked against that definition integrated by brute force (analytic ground truth) on pictures
 * given to FFmpeg as uncompressed YUV4MPEG2 files, so the decoder changes nothing.
 */
class VideoSourceTest {
    @TempDir
    Path dir;

    /** Integrates the source over output pixel (dx, dy)'s footprint. */
    private static double areaMean(byte[] src, int sw, int sh, int dw, int dh, int dx, int dy) {
        double sx = (double) sw / dw;
        double sy = (double) sh / dh;
        double x0 = dx * sx;
        double x1 = (dx + 1) * sx;
        double y0 = dy * sy;
        double y1 = (dy + 1) * sy;
        double sum = 0;
        for (int y = (int) Math.floor(y0); y < Math.ceil(y1); y++) {
            double cy = Math.min(y1, y + 1) - Math.max(y0, y);
            for (int x = (int) Math.floor(x0); x < Math.ceil(x1); x++) {
                double cx = Math.min(x1, x + 1) - Math.max(x0, x);
                sum += cx * cy * (src[y * sw + x] & 0xff);
            }
        }
        return sum / (sx * sy);
    }

    /**
     * A picture with what a camera sees at every scale: smooth gradients, hard edges and per-pixel noise.
     */
    private static byte[] picture(int w, int h, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        byte[] p = new byte[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double v = 60 + 100.0 * x / w + 40 * Math.sin(y * 0.05) + (((x / 37) + (y / 23)) % 2 == 0 ? 30 : 0)
                        + r.nextInt(-20, 21);
                p[y * w + x] = (byte) Math.max(0, Math.min(255, (int) v));
            }
        }
        return p;
    }

    /** An uncompressed 4:2:0 YUV4MPEG2 file (the format's header, FRAME markers, Y then U then V planes). */
    private Path y4m(int w, int h, byte[][] lumas) throws IOException {
        Path f = dir.resolve(w + "x" + h + ".y4m");
        int cw = (w + 1) / 2;
        int ch = (h + 1) / 2;
        byte[] chroma = new byte[cw * ch];
        java.util.Arrays.fill(chroma, (byte) 128);
        try (OutputStream out = new java.io.BufferedOutputStream(Files.newOutputStream(f))) {
            out.write(("YUV4MPEG2 W" + w + " H" + h + " F15:1 Ip A1:1 C420jpeg\n").getBytes(StandardCharsets.US_ASCII));
            for (byte[] y : lumas) {
                out.write("FRAME\n".getBytes(StandardCharsets.US_ASCII));
                out.write(y);
                out.write(chroma);
                out.write(chroma);
            }
        }
        return f;
    }

    private static final VideoSource.Health NO_HEALTH = new VideoSource.Health() {
        @Override
        public void lost(String reason, double streamSeconds) {
        }

        @Override
        public void back(double streamSeconds) {
        }
    };

    /** Reads every frame of a file at the given analysis width and checks each against the area means. */
    private void check(int w, int h, int analysisWidth, int wantHeight, double tolerance) throws Exception {
        byte[][] lumas = {picture(w, h, 1), picture(w, h, 2), picture(w, h, 3)};
        Path file = y4m(w, h, lumas);
        FrameSlot slot = new FrameSlot(true);
        VideoSource source = new VideoSource("test", new SourceOptions(file.toString(), false, false, analysisWidth,
                1000, 0, SourceInput.DEFAULTS), slot, NO_HEALTH, null);
        Thread t = new Thread(source, "capture-test");
        t.start();
        int frames = 0;
        double worst = 0;
        for (GrayFrame f; (f = slot.take(10_000)) != null; frames++) {
            assertEquals(Math.min(analysisWidth, w), f.width);
            assertEquals(wantHeight, f.height);
            assertEquals(frames, f.frameIndex);
            assertEquals(frames / 15.0, f.streamSeconds, 1e-6);
            for (int y = 0; y < f.height; y++) {
                for (int x = 0; x < f.width; x++) {
                    double want = areaMean(lumas[frames], w, h, f.width, f.height, x, y);
                    worst = Math.max(worst, Math.abs(want - (f.pixels[y * f.width + x] & 0xff)));
                }
            }
        }
        t.join(10_000);
        assertEquals(3, frames, w + "x" + h + ": frames read");
        assertTrue(worst <= tolerance, w + "x" + h + " → " + analysisWidth + ": worst difference from the area mean "
                + worst + " grey levels (allowed " + tolerance + ")");
        assertEquals(0, source.decodeErrors());
    }

    @Test
    void shrinksByAreaAtWholeNumberRatios() throws Exception {
        // 4× (720p), 6× (1080p) and 2×; measured worst 0.625: rounding to whole grey levels plus swscale's
        // fixed-point filter weights
        check(1280, 720, 320, 180, 1.0);
        check(1920, 1080, 320, 180, 1.0);
        check(640, 360, 320, 180, 1.0);
    }

    @Test
    void shrinksByAreaAtOtherRatiosAndKeepsTheAspect() throws Exception {
        // 800×600 → 320×240 is 2.5× (measured worst 0.6); 1000×562 gives 179.8, rounded to the even 180
        check(800, 600, 320, 240, 1.0);
        check(1000, 562, 320, 180, 1.0);
    }

    @Test
    void smallerPicturesStayAtTheirSize() throws Exception {
        check(160, 120, 320, 120, 0.0);
    }

    @Test
    void keepsAspectRatioWithEvenHeight() {
        assertEquals(180, Shrink.heightFor(1280, 720, 320));
        assertEquals(240, Shrink.heightFor(640, 480, 320));
        assertEquals(182, Shrink.heightFor(1920, 1088, 320));
    }
}
