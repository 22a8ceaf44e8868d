package wayward.flow;

import java.util.SplittableRandom;

/** The frame pair every flow benchmark uses: a smooth random texture moved by (1.5, −0.7) px, σ = 2 noise. */
final class BenchFrames {
    private BenchFrames() {
    }

    static byte[][] pair(int w, int h) {
        SplittableRandom r = new SplittableRandom(1);
        double[][] waves = new double[12][4];
        for (double[] wv : waves) {
            double wl = 6 + r.nextDouble() * 34;
            double ang = r.nextDouble() * Math.PI;
            wv[0] = Math.cos(ang) / wl;
            wv[1] = Math.sin(ang) / wl;
            wv[2] = r.nextDouble() * 2 * Math.PI;
            wv[3] = 6 + r.nextDouble() * 6;
        }
        return new byte[][] {render(w, h, 0, 0, waves, r), render(w, h, 1.5, -0.7, waves, r)};
    }

    private static byte[] render(int w, int h, double sx, double sy, double[][] waves, SplittableRandom r) {
        byte[] out = new byte[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double s = 128;
                for (double[] wv : waves) {
                    s += wv[3] * Math.sin(2 * Math.PI * (wv[0] * (x - sx) + wv[1] * (y - sy)) + wv[2]);
                }
                s += 2 * Math.sqrt(-2 * Math.log(1 - r.nextDouble())) * Math.cos(2 * Math.PI * r.nextDouble());
                out[y * w + x] = (byte) Math.max(0, Math.min(255, Math.round(s)));
            }
        }
        return out;
    }
}
