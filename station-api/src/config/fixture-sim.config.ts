// The file is read by the simulation module; the environment check reads it here to refuse a bad file at start.
export { readSimulatorConfigFile, SimulatorConfigFileError } from '../simulation/simulator-config-file';
