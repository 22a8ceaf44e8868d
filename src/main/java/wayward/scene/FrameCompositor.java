package wayward.scene;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;

/**
 * A scene's pictures, one after another: the ground as the shaking or bumped camera sees it, swaying foliage and
 * the movers, then the nuisances, tampering and sensor noise, as 8-bit grey. Its random streams run on from frame
 * to frame, so the pictures must be asked for in order.
 */
final class FrameCompositor {
    private final Scene scene;
    private final int w;
    private final int h;
    private final float[] background;
    private final List<float[]> textures = new ArrayList<>();
    private final float[] flickerWeight;
    private final double[] flickerKnots;
    private final SplittableRandom noise;
    private final List<float[]> swayTextures = new ArrayList<>();
    private final SplittableRandom rainRandom;
    private final double shakePhaseX;
    private final double shakePhaseY;
    private final float[] shifted;
    private final float[] canvas;
    private final byte[] bytes;

    FrameCompositor(Scene scene) {
        this.scene = scene;
        w = scene.width();
        h = scene.height();
        background = Textures.background(scene, w, h, new SplittableRandom(scene.seed()));
        for (int i = 0; i < scene.movers().size(); i++) {
            Scene.Mover m = scene.movers().get(i);
            textures.add(Textures.mover(m.look(), pixels(m.width(), w), pixels(m.height(), h),
                    scene.seed() * 31 + i + 1));
        }
        flickerWeight = Effects.flickerWeight(scene.nuisances().flicker(), w, h);
        flickerKnots = Effects.flickerKnots(scene.nuisances().flicker(), scene.seconds(),
                new SplittableRandom(scene.seed() * 19 + 5));
        noise = new SplittableRandom(scene.seed() ^ 0x5DEECE66DL);
        Scene.Nuisances nu = scene.nuisances();
        for (int i = 0; i < nu.sways().size(); i++) {
            Scene.Sway sw = nu.sways().get(i);
            swayTextures.add(Textures.foliage(pixels(sw.width(), w), pixels(sw.height(), h),
                    new SplittableRandom(scene.seed() * 97 + i)));
        }
        rainRandom = new SplittableRandom(scene.seed() * 13 + 7);
        SplittableRandom shakeRandom = new SplittableRandom(scene.seed() * 17 + 3);
        shakePhaseX = shakeRandom.nextDouble() * 2 * Math.PI;
        shakePhaseY = shakeRandom.nextDouble() * 2 * Math.PI;
        shifted = new float[w * h];
        canvas = new float[w * h];
        bytes = new byte[w * h];
    }

    /**
     * The picture at t, w × h grey levels row by row (the same array every time, overwritten); a frozen camera
     * gives the previous picture again.
     */
    byte[] render(double t) {
        Scene.Nuisances nu = scene.nuisances();
        // the camera's own movement: shake (two sinusoids) and a lasting bump; the world shifts the other way
        double ox = 0;
        double oy = 0;
        if (nu.shakePx() > 0) {
            ox += nu.shakePx() * Math.sin(2 * Math.PI * nu.shakeHz() * t + shakePhaseX);
            oy += nu.shakePx() * Math.sin(2 * Math.PI * nu.shakeHz() * 1.37 * t + shakePhaseY);
        }
        if (nu.bump() != null && t >= nu.bump().atSeconds()) {
            ox += nu.bump().dxPx();
            oy += nu.bump().dyPx();
        }
        if (ox == 0 && oy == 0) {
            System.arraycopy(background, 0, canvas, 0, canvas.length);
        } else {
            Drawing.shift(background, canvas, w, h, ox, oy);
        }
        for (int i = 0; i < nu.sways().size(); i++) {
            Scene.Sway sw = nu.sways().get(i);
            double a = sw.amplitudePx() * Math.sin(2 * Math.PI * t / sw.periodSeconds());
            double ang = Math.toRadians(sw.angleDeg());
            Drawing.draw(canvas, w, h, swayTextures.get(i), pixels(sw.width(), w), pixels(sw.height(), h),
                    sw.x() * w + a * Math.sin(ang) - ox, sw.y() * h - a * Math.cos(ang) - oy);
        }
        drawMovers(t, ox, oy);
        addNuisances(nu, t, ox, oy);
        Scene.Tamper tamper = nu.tamper();
        boolean tampered = tamper != null && t >= tamper.atSeconds();
        if (tampered && tamper.kind().equals("freeze")) {
            return bytes; // the last picture again
        }
        if (tampered && tamper.kind().equals("cover")) {
            Arrays.fill(canvas, 38f);
        }
        if (tampered && tamper.kind().equals("blur")) {
            Drawing.blur(canvas, shifted, w, h, 6);
            Drawing.blur(canvas, shifted, w, h, 6);
        }
        for (int p = 0; p < canvas.length; p++) {
            double v = canvas[p] + scene.noise() * gaussian(noise);
            int q = (int) Math.round(v);
            bytes[p] = (byte) (q < 0 ? 0 : (q > 255 ? 255 : q));
        }
        return bytes;
    }

    private void drawMovers(double t, double ox, double oy) {
        for (int i = 0; i < scene.movers().size(); i++) {
            Scene.Mover m = scene.movers().get(i);
            if (t >= m.startSeconds() && t <= m.endSeconds()) {
                double[] c = m.centreAt(t);
                if (Scene.Look.NOISE.equals(m.look()) && m.ws() == null) {
                    // the first generator's drawing, kept so that older scenes render the very same
                    Drawing.draw(canvas, w, h, textures.get(i), pixels(m.width(), w), pixels(m.height(), h),
                            c[0] * w - ox, c[1] * h - oy);
                } else {
                    double[] size = m.sizeAt(t);
                    Drawing.drawSoft(canvas, w, h, textures.get(i), pixels(m.width(), w), pixels(m.height(), h),
                            c[0] * w - ox, c[1] * h - oy, size[0] * w, size[1] * h);
                }
            }
        }
    }

    /** Shadow, light changes, flicker, glare and rain, in that order. */
    private void addNuisances(Scene.Nuisances nu, double t, double ox, double oy) {
        if (nu.shadow() != null && t >= nu.shadow().startSeconds() && t <= nu.shadow().endSeconds()) {
            Effects.shadow(canvas, w, h, nu.shadow(), t);
        }
        double[] light = Effects.light(nu.lights(), t);
        if (light[0] != 1 || light[1] != 0) {
            for (int p = 0; p < canvas.length; p++) {
                canvas[p] = (float) (canvas[p] * light[0] + light[1]);
            }
        }
        if (nu.flicker() != null) {
            double g = Effects.flickerGain(nu.flicker(), flickerKnots, t) - 1;
            for (int p = 0; p < canvas.length; p++) {
                canvas[p] = (float) (canvas[p] * (1 + g * (flickerWeight == null ? 1 : flickerWeight[p])));
            }
        }
        for (Scene.Glare glare : nu.glares()) {
            Effects.glare(canvas, w, h, glare, scene.movers(), t, ox, oy);
        }
        if (nu.rain() != null) {
            Effects.rain(canvas, w, h, nu.rain(), rainRandom);
        }
    }

    private static int pixels(double fraction, int size) {
        return Math.max(4, (int) Math.round(fraction * size));
    }

    private static double gaussian(SplittableRandom r) {
        // Box–Muller; one value per call is enough here
        double u1 = 1.0 - r.nextDouble();
        double u2 = r.nextDouble();
        return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
    }
}
