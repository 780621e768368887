export { DispositionSection } from './components/disposition-section';
export { EquipmentHazards, SanitizationCheck } from './components/sanitization-guidance';
