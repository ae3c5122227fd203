export { WaveformPlot, type WaveformMarker, type WaveformPlotProps, type WaveformWindow } from "./waveform-plot";
export { ReadingsTable } from "./readings-table";
export { SIGNALS, type SignalKey } from "./signals";
export { describeWaveform } from "./summary";
