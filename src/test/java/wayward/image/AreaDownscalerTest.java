package wayward.image;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class AreaDownscalerTest {
    /** Plain reference: integrate the source over each output pixel's footprint by brute force. */
    private static double reference(byte[] src, int sw, int sh, int dw, int dh, int dx, int dy) {
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

    @Test
    void matchesBruteForceAreaMeanOnRandomPicturesAndOddSizes() {
        SplittableRandom r = new SplittableRandom(1);
        int[][] sizes = {{1, 1, 1, 1}, {7, 5, 3, 2}, {640, 360, 320, 180}, {1280, 720, 320, 180}, {1920, 1080, 640, 360}, {101, 77, 33, 31}};
        for (int[] s : sizes) {
            byte[] src = new byte[s[0] * s[1]];
            for (int i = 0; i < src.length; i++) {
                src[i] = (byte) r.nextInt(256);
            }
            GrayFrame out = new GrayFrame(s[2], s[3]);
            new AreaDownscaler(s[0], s[1], s[2], s[3]).downscale(src, 0, s[0], out);
            for (int y = 0; y < s[3]; y++) {
                for (int x = 0; x < s[2]; x++) {
                    double want = reference(src, s[0], s[1], s[2], s[3], x, y);
                    // output is rounded to 8 bits: within half a grey level plus float error
                    assertEquals(want, out.pixels[y * s[2] + x] & 0xff, 0.51, s[0] + "x" + s[1] + " at " + x + "," + y);
                }
            }
        }
    }

    @Test
    void honoursRowStride() {
        byte[] src = new byte[4 * 2];
        src[0] = 10;
        src[1] = 30;
        src[4] = 50;
        src[5] = 70;
        src[2] = (byte) 255; // padding bytes beyond the width must not be read
        src[3] = (byte) 255;
        GrayFrame out = new GrayFrame(1, 1);
        new AreaDownscaler(2, 2, 1, 1).downscale(src, 0, 4, out);
        assertEquals(40, out.pixels[0] & 0xff);
    }

    @Test
    void keepsAspectRatioWithEvenHeight() {
        assertEquals(180, AreaDownscaler.heightFor(1280, 720, 320));
        assertEquals(240, AreaDownscaler.heightFor(640, 480, 320));
        assertEquals(182, AreaDownscaler.heightFor(1920, 1088, 320));
    }

    @Test
    void refusesUpscaling() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new AreaDownscaler(10, 10, 20, 5));
        assertEquals("target size: 20x5 (expected 1x1 up to the source size 10x10)", e.getMessage());
    }
}
