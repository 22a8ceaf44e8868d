package wayward.scene;

import java.util.List;
import java.util.SplittableRandom;

/** What the scene's nuisances do to a picture: light changes, flicker, headlight glare, a shadow band, rain. */
final class Effects {
    private Effects() {
    }

    /** Gain and offset of the picture's brightness at t from the light changes (ramped linearly). */
    static double[] light(List<Scene.Light> lights, double t) {
        double gain = 1;
        double offset = 0;
        for (Scene.Light l : lights) {
            if (t < l.atSeconds()) {
                break;
            }
            double a = l.rampSeconds() <= 0 ? 1 : Math.min(1, (t - l.atSeconds()) / l.rampSeconds());
            gain += a * (l.gain() - gain);
            offset += a * (l.offset() - offset);
        }
        return new double[] {gain, offset};
    }

    /** Per pixel weight of a local flicker (Gaussian pool of light), or null for the whole picture. */
    static float[] flickerWeight(Scene.Flicker f, int w, int h) {
        if (f == null || Double.isNaN(f.radius())) {
            return null;
        }
        float[] weight = new float[w * h];
        double sigma = f.radius() * w;
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double dx = x + 0.5 - f.centreX() * w;
                double dy = y + 0.5 - f.centreY() * h;
                weight[y * w + x] = (float) Math.exp(-(dx * dx + dy * dy) / (2 * sigma * sigma));
            }
        }
        return weight;
    }

    /** The random flicker's levels, one per 1/hz s (null for mains flicker). */
    static double[] flickerKnots(Scene.Flicker f, double seconds, SplittableRandom r) {
        if (f == null || !f.kind().equals("random")) {
            return null;
        }
        double[] k = new double[(int) Math.ceil(seconds * f.hz()) + 2];
        for (int i = 0; i < k.length; i++) {
            k[i] = (r.nextDouble() * 2 - 1) * f.amplitude();
        }
        return k;
    }

    /** The flicker's gain at t. */
    static double flickerGain(Scene.Flicker f, double[] knots, double t) {
        if (f.kind().equals("mains")) {
            return 1 + f.amplitude() * Math.sin(2 * Math.PI * f.hz() * t);
        }
        double k = t * f.hz();
        int i = (int) k;
        return 1 + knots[i] + (k - i) * (knots[i + 1] - knots[i]);
    }

    /** Adds a glare blob where it is at t (in the world: it moves with the picture when the camera does). */
    static void glare(float[] canvas, int w, int h, Scene.Glare g, List<Scene.Mover> movers, double t,
            double ox, double oy) {
        double cx;
        double cy;
        if (g.moverId() != null) {
            Scene.Mover m = movers.stream().filter(x -> x.id().equals(g.moverId())).findFirst().orElseThrow();
            if (t < m.startSeconds() || t > m.endSeconds()) {
                return;
            }
            double[] c = m.centreAt(t);
            cx = c[0] + g.dx();
            cy = c[1] + g.dy();
        } else {
            if (t < g.startSeconds() || t > g.endSeconds()) {
                return;
            }
            double a = (t - g.startSeconds()) / (g.endSeconds() - g.startSeconds());
            cx = g.fromX() + a * (g.toX() - g.fromX());
            cy = g.fromY() + a * (g.toY() - g.fromY());
        }
        double px = cx * w - ox;
        double py = cy * h - oy;
        double sigma = g.radius() * w;
        int reach = (int) Math.ceil(3 * sigma);
        for (int y = Math.max(0, (int) py - reach); y <= Math.min(h - 1, (int) py + reach); y++) {
            for (int x = Math.max(0, (int) px - reach); x <= Math.min(w - 1, (int) px + reach); x++) {
                double dx = x - px;
                double dy = y - py;
                canvas[y * w + x] += (float) (g.brightness() * Math.exp(-(dx * dx + dy * dy) / (2 * sigma * sigma)));
            }
        }
    }

    /** A soft vertical band of shade (cos² across its width) at its place at t. */
    static void shadow(float[] canvas, int w, int h, Scene.Shadow s, double t) {
        double a = (t - s.startSeconds()) / (s.endSeconds() - s.startSeconds());
        double centre = (s.fromX() + a * (s.toX() - s.fromX())) * w;
        double half = s.width() * w / 2;
        for (int x = Math.max(0, (int) (centre - half)); x < Math.min(w, (int) (centre + half) + 1); x++) {
            double d = (x + 0.5 - centre) / half;
            if (Math.abs(d) >= 1) {
                continue;
            }
            double c = Math.cos(d * Math.PI / 2);
            float factor = (float) (1 - s.darkness() * c * c);
            for (int y = 0; y < h; y++) {
                canvas[y * w + x] *= factor;
            }
        }
    }

    /** Short bright streaks at random places (new every frame). */
    static void rain(float[] canvas, int w, int h, Scene.Rain r, SplittableRandom random) {
        double ang = Math.toRadians(r.angleDeg());
        double dx = Math.sin(ang);
        double dy = -Math.cos(ang);
        for (int k = 0; k < r.streaksPerFrame(); k++) {
            double x = random.nextDouble() * w;
            double y = random.nextDouble() * h;
            for (int step = 0; step < r.lengthPx(); step++) {
                int px = (int) (x + dx * step);
                int py = (int) (y + dy * step);
                if (px >= 0 && px < w && py >= 0 && py < h) {
                    canvas[py * w + px] += (float) r.brightness();
                }
            }
        }
    }
}
