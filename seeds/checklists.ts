/**
 * The six skills checklists of the demo scenario, written for Tidemark in vendor-neutral words
 * (mode names after ISO 19223 and Chatburn's taxonomy, Respir Care 2014;59(11):1747–63).
 * Step content is common practice, no source; each checklist points the reader to the device's
 * instructions for use and local policy, which always win.
 */
import type { CHECKLIST_METHODS, ChecklistStep } from "../app/db/schema";

export type ChecklistSpec = {
  key: string;
  title: string;
  skill: string;
  method: (typeof CHECKLIST_METHODS)[number];
  steps: ChecklistStep[];
  references: string;
};

const step = (text: string, critical = false): ChecklistStep => ({ text, critical });

const LOCAL = "Follow the ventilator's instructions for use and local policy; this checklist does not replace them.";

export const CHECKLISTS: readonly ChecklistSpec[] = [
  {
    key: "ventilator-setup",
    title: "Ventilator set-up and pre-use check",
    skill: "Ventilator set-up",
    method: "direct-observation",
    references: `Respiratory care procedure RC-12, ventilator preparation. ${LOCAL}`,
    steps: [
      step("Confirms the patient's identity with two identifiers and reads the current ventilation order.", true),
      step("Checks that the ventilator's maintenance label is in date and the unit is clean and undamaged."),
      step("Connects to emergency-backed power and to the wall oxygen and air supplies; confirms the supply pressures on the display."),
      step("Assembles a new single-patient circuit with humidification and filters placed as the local procedure shows."),
      step("Runs the ventilator's own pre-use check with the circuit attached and records the result; does not use a ventilator that fails it.", true),
      step("Enters the ordered mode and settings and sets the high-pressure, low-pressure, low exhaled volume and apnoea alarms to local policy.", true),
      step("Ventilates a test lung and confirms that volume, pressure and the alarms respond as expected."),
      step("Places a manual resuscitation bag with a mask and an oxygen supply at the bedside.", true),
      step("Records the check, the settings and the alarm limits."),
    ],
  },
  {
    key: "vc-to-apc",
    title: "Changing from volume control to adaptive pressure control and confirming the first breaths",
    skill: "Mode change to adaptive pressure control",
    method: "direct-observation",
    references: `Respiratory care procedure RC-21, mode changes. ${LOCAL}`,
    steps: [
      step("Confirms the order or protocol for the change and the target tidal volume.", true),
      step("Records the current peak and plateau pressures, exhaled tidal volume, rate and oxygen saturation as a baseline."),
      step("Sets the target tidal volume, inspiratory time, rate, PEEP and oxygen fraction for adaptive pressure control before switching."),
      step("Sets the high-pressure alarm and explains that the adaptive mode keeps its working pressure a set margin below that limit.", true),
      step("Switches modes at the bedside and watches the test breath and the breaths that follow.", true),
      step("Confirms that the inspiratory pressure moves toward the target in small steps and that exhaled volumes settle near the target."),
      step("Explains that when the patient pulls harder the machine lowers its pressure, so volumes above target can come from the patient's own effort."),
      step("Assesses the patient: chest rise, breath sounds, oxygen saturation, heart rate, comfort and signs of asynchrony.", true),
      step("Stays until the volumes are steady, then sets the low exhaled volume alarm for the new pattern."),
      step("Records the change, the settings, the first readings and the patient's response, and tells the nurse."),
    ],
  },
  {
    key: "high-pressure-alarm",
    title: "Responding to a high-pressure alarm",
    skill: "High-pressure alarm response",
    method: "simulation",
    references: `Respiratory care procedure RC-30, alarm response. ${LOCAL}`,
    steps: [
      step("Goes to the patient at once and looks at the patient before silencing the alarm.", true),
      step("Assesses distress, chest movement, coughing, biting, colour and oxygen saturation.", true),
      step("Reads the peak and plateau pressures (an inspiratory hold in volume control) to tell a resistance problem from a compliance problem."),
      step("Checks the circuit and airway for water, kinks and secretions, and passes a suction catheter to confirm the airway is open."),
      step("If the patient cannot be ventilated or is getting worse, disconnects, ventilates by hand with oxygen and calls for help.", true),
      step("Explains that in volume control inspiration ends at the high-pressure limit, so the rest of the set volume was not delivered."),
      step("Treats the cause found with the team (suction, ordered bronchodilator, sedation review, repositioning) and confirms the pressures fall back."),
      step("Does not raise the alarm limit to quiet the alarm without finding the cause and following policy.", true),
      step("Records the event, the cause and the action taken."),
    ],
  },
  {
    key: "flow-starvation",
    title: "Recognising and correcting flow starvation",
    skill: "Flow starvation correction",
    method: "simulation",
    references: `Respiratory care procedure RC-21, mode changes; RC-30, alarm response. ${LOCAL}`,
    steps: [
      step("Identifies the scooped, concave inspiratory pressure waveform during volume control with a set flow.", true),
      step("Links the waveform to signs of effort: accessory muscle use, a fast rate, visible discomfort."),
      step("Explains that the patient wants more flow than is set, so the peak pressure falls and a low-pressure alarm can sound while the volume still looks normal."),
      step("Proposes a correction: a higher set flow or shorter inspiratory time, a different flow pattern, or a mode in which the patient can draw the flow they want (pressure control, adaptive pressure control, pressure support).", true),
      step("Looks for causes of a high drive to breathe (pain, anxiety, fever, acidosis, low oxygen) and raises them with the team."),
      step("After the change, confirms that the scoop has gone and the patient looks more comfortable."),
      step("Records the finding and the change made."),
    ],
  },
  {
    key: "inline-suction",
    title: "In-line suctioning",
    skill: "In-line suctioning",
    method: "return-demonstration",
    references: `Respiratory care procedure RC-44, airway clearance. ${LOCAL}`,
    steps: [
      step("Assesses the need: visible or audible secretions, a saw-tooth flow waveform, rising peak pressure or falling volume, falling saturation."),
      step("Cleans hands and explains the procedure to the patient."),
      step("Gives extra oxygen before suctioning as local policy says."),
      step("Sets the suction pressure to local policy and checks the in-line catheter's change date."),
      step("Advances the catheter without suction to the measured depth, not beyond the tip of the airway.", true),
      step("Applies suction only while withdrawing, for the shortest time needed and within the local time limit.", true),
      step("Watches saturation, heart rate and rhythm throughout and stops if the patient worsens.", true),
      step("Rinses the catheter through its irrigation port, withdraws it fully and locks the control valve."),
      step("Reassesses breath sounds, waveforms and volumes, and records the secretions and how the patient tolerated it."),
    ],
  },
  {
    key: "circuit-change",
    title: "Circuit change",
    skill: "Circuit change",
    method: "return-demonstration",
    references: `Respiratory care procedure RC-15, circuit care. ${LOCAL}`,
    steps: [
      step("Knows when the circuit is changed under local policy: when visibly soiled or not working, not on a short fixed schedule."),
      step("Gathers a new circuit, filters and humidification parts, a manual resuscitation bag with oxygen, and a helper when needed."),
      step("Gives extra oxygen as policy says and plans the disconnection to limit the loss of PEEP."),
      step("Keeps the patient ventilated during the change and keeps the disconnection as short as possible.", true),
      step("Connects the new circuit, checks that every joint is tight and that nothing pulls on the airway.", true),
      step("Runs the circuit or leak check that the ventilator allows during use, or the one local policy names."),
      step("Confirms that volumes, pressures and alarms match those before the change and that the patient is stable.", true),
      step("Discards the old circuit as clinical waste and labels the new one with the date."),
      step("Records the change."),
    ],
  },
];
