package wayward.capture;

/**
 * How a camera's source is read.
 *
 * @param source        file path or URL
 * @param loop          start a file again from the beginning at its end
 * @param realtime      pace a file to its own timestamps, as a camera would deliver it
 * @param analysisWidth width of the analysis frames, pixels
 * @param analysisFps   most frames per second handed to analysis
 * @param maxLoops      with loop: stop after this many passes (0 = forever)
 * @param input         transport and webcam options
 */
public record SourceOptions(String source, boolean loop, boolean realtime, int analysisWidth, double analysisFps,
        int maxLoops, SourceInput input) {
}
