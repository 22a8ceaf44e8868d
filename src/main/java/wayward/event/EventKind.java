package wayward.event;

/** What an event reports. The JSON names are part of the event record contract. */
public enum EventKind {
    /** Movement against a zone's permitted heading. */
    WRONG_WAY("wrong_way"),
    /** Any movement, for zones without a heading. */
    MOTION("motion"),
    /** The camera stopped delivering frames. */
    CAMERA_LOST("camera_lost"),
    /** The camera delivers frames again. */
    CAMERA_BACK("camera_back");

    private final String jsonName;

    EventKind(String jsonName) {
        this.jsonName = jsonName;
    }

    public String jsonName() {
        return jsonName;
    }
}
