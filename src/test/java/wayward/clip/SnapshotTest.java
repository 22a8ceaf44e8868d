package wayward.clip;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.time.Instant;
import java.util.Arrays;
import org.junit.jupiter.api.Test;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.picture.FlowColours;

/**
 * The event snapshot read as pixels: the picture keeps its size with the caption band below it, the band carries
 * text, the two direction dials and the colour wheel (whose hues are checked around the circle with an HSV hue
 * computed here, against FlowColours' mapping and against the Baker et al. wheel's known layout), and the zone
 * outline stays neutral where coloured flow arrows cross it.
 */
class SnapshotTest {
    private static final int W = 320;
    private static final int H = 180;
    private static final int GRAY = 100;

    /** Hue in degrees [0, 360) of an RGB triple: the hexcone formula of Smith (1978), as in HSV. */
    private static double hue(int rgb) {
        double r = ((rgb >> 16) & 0xff) / 255.0;
        double g = ((rgb >> 8) & 0xff) / 255.0;
        double b = (rgb & 0xff) / 255.0;
        double max = Math.max(r, Math.max(g, b));
        double min = Math.min(r, Math.min(g, b));
        double c = max - min;
        if (c == 0) {
            return Double.NaN;
        }
        double h;
        if (max == r) {
            h = ((g - b) / c) % 6;
        } else if (max == g) {
            h = (b - r) / c + 2;
        } else {
            h = (r - g) / c + 4;
        }
        return (h * 60 + 360) % 360;
    }

    private static double hueGap(double a, double b) {
        double d = Math.abs(a - b) % 360;
        return Math.min(d, 360 - d);
    }

    private static boolean neutral(int rgb, int tolerance) {
        int r = (rgb >> 16) & 0xff;
        int g = (rgb >> 8) & 0xff;
        int b = rgb & 0xff;
        return Math.abs(r - g) <= tolerance && Math.abs(g - b) <= tolerance && Math.abs(r - b) <= tolerance;
    }

    private static BufferedImage snapshot(double moved, double allowed) {
        GrayFrame frame = new GrayFrame(W, H);
        Arrays.fill(frame.pixels, (byte) GRAY);
        FlowField flow = new FlowField(W, H, 4);
        // every direction somewhere: arrows of many colours, also across the zone's outline
        for (int k = 0; k < flow.u.length; k++) {
            double a = k * 0.7;
            flow.u[k] = (float) (4 * Math.cos(a));
            flow.v[k] = (float) (4 * Math.sin(a));
        }
        double[] xs = {0.2, 0.8, 0.8, 0.2};
        double[] ys = {0.2, 0.2, 0.8, 0.8};
        return Snapshot.draw(frame, flow, xs, ys, 0.5, null, new Snapshot.Caption("dock-east", "exit-ramp",
                "wrong_way", Instant.parse("2026-12-03T15:33:43.250Z"), moved, allowed, 36.3));
    }

    @Test
    void captionBandLiesBelowThePictureAtItsHeight() {
        BufferedImage img = snapshot(90, 0);
        assertEquals(2 * W, img.getWidth());
        assertEquals(2 * H + Snapshot.BAND_HEIGHT, img.getHeight());
        int top = 2 * H;
        for (int y = top; y < img.getHeight(); y++) {
            assertEquals(Snapshot.BAND_RGB, img.getRGB(2, y) & 0xffffff, "band background at row " + y);
        }
        // the picture ends right above the band, untouched there (no arrows near the left edge)
        assertEquals(GRAY * 0x010101, img.getRGB(2, top - 1) & 0xffffff);
        // text in the band's left part: light pixels on the dark background
        int light = 0;
        for (int y = top; y < img.getHeight(); y++) {
            for (int x = 0; x < 300; x++) {
                if ((img.getRGB(x, y) & 0xff) > 160) {
                    light++;
                }
            }
        }
        assertTrue(light > 300, "text pixels in the band: " + light);
    }

    @Test
    void wheelInTheBandShowsTheHueOfEachDirection() {
        BufferedImage img = snapshot(90, 0);
        int cx = Snapshot.wheelX(img.getWidth());
        int cy = Snapshot.wheelY(2 * H);
        double r = 0.8 * Snapshot.WHEEL_RADIUS;
        double[] hues = new double[8];
        for (int k = 0; k < 8; k++) {
            double bearing = Math.toRadians(45 * k);
            double ux = Math.sin(bearing);
            double uy = -Math.cos(bearing); // image y grows downwards
            int px = (int) Math.round(cx + r * ux);
            int py = (int) Math.round(cy + r * uy);
            int rgb = img.getRGB(px, py) & 0xffffff;
            hues[k] = hue(rgb);
            // FlowColours' own colour of the direction from the wheel's centre to that pixel, at full speed (a
            // paler point of the same direction keeps its hue)
            double dx = px - cx;
            double dy = py - cy;
            double expected = hue(FlowColours.rgb(dx / Math.hypot(dx, dy), dy / Math.hypot(dx, dy)));
            assertTrue(hueGap(hues[k], expected) < 3, "bearing " + 45 * k + ": hue " + hues[k] + ", mapping "
                    + expected);
        }
        for (int a = 0; a < 8; a++) {
            for (int b = a + 1; b < 8; b++) {
                assertTrue(hueGap(hues[a], hues[b]) > 10, "bearings " + 45 * a + " and " + 45 * b + " share a hue");
            }
        }
        // the layout of the Baker et al. (2011) wheel, from memory of their colour-code figure: motion to the
        // right is red, downwards yellow-orange, to the left cyan-blue, upwards blue-violet
        assertTrue(hueGap(hues[2], 355) < 20, "right: " + hues[2]);
        assertTrue(hueGap(hues[4], 50) < 20, "down: " + hues[4]);
        assertTrue(hueGap(hues[6], 195) < 20, "left: " + hues[6]);
        assertTrue(hueGap(hues[0], 255) < 20, "up: " + hues[0]);
    }

    @Test
    void dialsShowTheMeasuredAndThePermittedDirection() {
        BufferedImage img = snapshot(90, 0);
        int top = 2 * H;
        int dy = Snapshot.dialY(top);
        int reach = (int) Math.round(0.6 * Snapshot.DIAL_RADIUS);
        int mx = Snapshot.movedDialX(img.getWidth());
        int movedTip = img.getRGB(mx + reach, dy) & 0xffffff;
        // (12°: the 55-hue wheel's two ends meet at "right", about 10° apart)
        assertTrue(hueGap(hue(movedTip), hue(FlowColours.rgb(1, 0))) < 12, "moved arrow points right in the "
                + "wheel's colour for right: " + Integer.toHexString(movedTip));
        assertEquals(Snapshot.BAND_RGB, img.getRGB(mx - reach, dy) & 0xffffff, "nothing to the left");
        int ax = Snapshot.allowedDialX(img.getWidth());
        int allowedTip = img.getRGB(ax, dy - reach) & 0xffffff;
        assertTrue(neutral(allowedTip, 0) && (allowedTip & 0xff) > 200, "allowed arrow points up in white: "
                + Integer.toHexString(allowedTip));
        assertEquals(Snapshot.BAND_RGB, img.getRGB(ax, dy + reach) & 0xffffff, "nothing below");
        // a zone without a permitted heading: no allowed arrow
        BufferedImage any = snapshot(90, Double.NaN);
        assertEquals(Snapshot.BAND_RGB, any.getRGB(ax, dy - reach) & 0xffffff);
    }

    @Test
    void zoneOutlineIsNeutralWhereArrowsCrossIt() {
        BufferedImage img = snapshot(90, 0);
        // the top edge at y = 0.2 of the picture and the left edge at x = 0.2, drawn at twice the size
        int edgeY = (int) Math.round(0.2 * H * 2);
        int edgeX = (int) Math.round(0.2 * W * 2);
        int coloured = 0;
        for (int x = (int) (0.25 * W * 2); x < (int) (0.75 * W * 2); x++) {
            for (int y = edgeY - 1; y <= edgeY; y++) {
                coloured += neutral(img.getRGB(x, y), 12) ? 0 : 1;
            }
        }
        for (int y = (int) (0.25 * H * 2); y < (int) (0.75 * H * 2); y++) {
            for (int x = edgeX - 1; x <= edgeX; x++) {
                coloured += neutral(img.getRGB(x, y), 12) ? 0 : 1;
            }
        }
        assertEquals(0, coloured, "coloured pixels on the outline");
        // and the arrows inside the zone are coloured (the check above is not vacuous)
        int inside = 0;
        for (int y = (int) (0.3 * H * 2); y < (int) (0.7 * H * 2); y++) {
            for (int x = (int) (0.3 * W * 2); x < (int) (0.7 * W * 2); x++) {
                inside += neutral(img.getRGB(x, y), 12) ? 0 : 1;
            }
        }
        assertTrue(inside > 1000, "coloured arrow pixels inside the zone: " + inside);
    }
}
