package wayward.zone;

/** The nearest track–group pair offered so far, for pairing nearest first; reused, never allocated per frame. */
final class Nearest {
    double distance;
    int track;
    int group;

    void clear() {
        distance = Double.MAX_VALUE;
        track = -1;
        group = -1;
    }

    void offer(double d, int k, int g) {
        if (d < distance) {
            distance = d;
            track = k;
            group = g;
        }
    }
}
