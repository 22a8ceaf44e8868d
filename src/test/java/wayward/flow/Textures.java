package wayward.flow;

import java.util.SplittableRandom;

/**
 * Analytic test pictures: a sum of sinusoids, evaluated exactly at any real position, so a frame moved by a
 * known displacement is exact ground truth (no resampling of a stored image).
 */
final class Textures {
    private final double[] fx;
    private final double[] fy;
    private final double[] phase;
    private final double[] amplitude;
    private final java.util.function.DoubleBinaryOperator custom;

    private Textures(java.util.function.DoubleBinaryOperator custom) {
        this.fx = null;
        this.fy = null;
        this.phase = null;
        this.amplitude = null;
        this.custom = custom;
    }

    /** A texture given by any function of the continuous position. */
    static Textures of(java.util.function.DoubleBinaryOperator f) {
        return new Textures(f);
    }

    /** @param seed picks the waves; wavelengths 6 to 40 px, random orientations */
    Textures(long seed, int waves) {
        custom = null;
        SplittableRandom r = new SplittableRandom(seed);
        fx = new double[waves];
        fy = new double[waves];
        phase = new double[waves];
        amplitude = new double[waves];
        for (int i = 0; i < waves; i++) {
            double wavelength = 6 + r.nextDouble() * 34;
            double angle = r.nextDouble() * Math.PI;
            fx[i] = Math.cos(angle) / wavelength;
            fy[i] = Math.sin(angle) / wavelength;
            phase[i] = r.nextDouble() * 2 * Math.PI;
            amplitude[i] = 70.0 / waves * (0.5 + r.nextDouble());
        }
    }

    double at(double x, double y) {
        if (custom != null) {
            return custom.applyAsDouble(x, y);
        }
        double s = 128;
        for (int i = 0; i < fx.length; i++) {
            s += amplitude[i] * Math.sin(2 * Math.PI * (fx[i] * x + fy[i] * y) + phase[i]);
        }
        return s;
    }

    /**
     * The picture sampled at pixel centres after the picture moved by (sx, sy) pixels: pixel (x, y) shows the
     * texture at (x − sx, y − sy). Gaussian noise of the given σ is added, then rounded to 8 bits.
     */
    byte[] render(int w, int h, double sx, double sy, double noise, SplittableRandom r) {
        return render(w, h, (x, y, out) -> {
            out[0] = x - sx;
            out[1] = y - sy;
        }, 1, 0, noise, r);
    }

    /** Where pixel (x, y) of a moved picture takes its texture from: writes the source position into out. */
    interface Source {
        void at(double x, double y, double[] out);
    }

    /**
     * A moved picture: pixel (x, y) shows the texture at {@code source(x, y)}, with brightness
     * {@code gain · v + offset}, Gaussian noise of σ {@code noise}, rounded to 8 bits.
     */
    byte[] render(int w, int h, Source source, double gain, double offset, double noise, SplittableRandom r) {
        byte[] out = new byte[w * h];
        double[] p = new double[2];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                source.at(x, y, p);
                double v = gain * at(p[0], p[1]) + offset;
                if (noise > 0) {
                    v += noise * Math.sqrt(-2 * Math.log(1 - r.nextDouble())) * Math.cos(2 * Math.PI * r.nextDouble());
                }
                long q = Math.round(v);
                out[y * w + x] = (byte) Math.max(0, Math.min(255, q));
            }
        }
        return out;
    }
}
