package wayward.analysis;

import wayward.zone.Movers;
import wayward.zone.ZoneReading;

/**
 * Receives every zone reading, the zone's movers (null for a zone without heading) and the rule's state after
 * them (analysis thread; replay reports). Both holders are refilled for the next frame: copy what you keep.
 */
@FunctionalInterface
public interface ReadingListener {
    void reading(CameraConfig camera, int zone, ZoneReading r, Movers movers, String ruleState);
}
